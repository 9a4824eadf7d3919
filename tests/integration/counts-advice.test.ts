/**
 * "Counts needed" off the certificate path (issue 19): the check worker simulates it once after
 * the check and the runner stores it beside the result (migration 0024); the signed result, which
 * issuing and the offline verifiers re-run, carries no simulated figure.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { certify, parseCounts, sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { countsAdvice } from '../../src/lib/certify/planner/check-counts';
import { startCheckRunner } from '../../src/lib/server/checks/registry';
import { getCheck, startCheck } from '../../src/lib/server/checks/checks';
import { planFromCheck } from '../../src/lib/server/checks/check-plan';
import { NotFoundError } from '../../src/lib/server/core/errors';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { addGroup, addUser, bytesOf, claimFields } from './backend-fixtures';
import { asUser } from './actors';
import { workerDatabase, type WorkerDatabase } from './worker-database';

let ctx: WorkerDatabase;
let ada: string;
let cyd: string;
let checkId: string;

// Isotropic η = 0.9 in d = 5, two bases: S = 2(η + (1 − η)/5) = 1.84 clears B_4 = 1 + 4/5 (§4.1,
// §7) at the point value, but 200 pairs per basis leave the 3σ lower bound below it.
const csv = toCountsCsv(sampledCounts(states.isotropic(5, 0.9), [0, 1], 200, 11));

beforeAll(async () => {
	ctx = await workerDatabase();
	const lake = await addGroup(ctx.database, 'Halvorsen Lake Photonics');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'author']]);
	const ridge = await addGroup(ctx.database, 'Ridge qudits');
	cyd = await addUser(ctx.database, 'Cyd Marsh', [[ridge, 'lead']]);
});
afterAll(async () => {
	await ctx.close();
});

describe('counts needed for an unsupported claim', () => {
	it('are simulated once by the worker and stored beside, not inside, the result', async () => {
		const claim = await createClaim(ctx.database, asUser(ada), {
			...claimFields,
			dimension: 5,
			claimedSchmidtNumber: 5
		});
		const dataset = await addDataset(ctx.database, asUser(ada), claim.id, {
			bytes: bytesOf(csv),
			originalName: 'short-run.csv'
		});
		const queued = await startCheck(ctx.database, asUser(ada), claim.id, { resamples: 2000 });
		await (await startCheckRunner(ctx.database)).idle();
		checkId = queued.id;
		const check = await getCheck(ctx.database, asUser(ada), queued.id);
		expect(check.status).toBe('done');
		const result = check.result!;
		expect(result.claim).toMatchObject({ verdict: 'not supported', moreCountsHelp: true });
		expect(Object.keys(result.claim!)).not.toContain('countsNeeded');
		// The stored advice is the engine's own simulation on the same counts and settings.
		const options = {
			method: 'mub-correlation',
			bases: [0, 1],
			resamples: 2000,
			confidence: check.confidence,
			seed: check.seed,
			claim: 5,
			inputSha256: dataset.sha256
		};
		const data = parseCounts(bytesOf(csv), 5);
		const direct = certify(data, options);
		expect(result).toEqual(JSON.parse(JSON.stringify(direct)));
		const advice = countsAdvice(data, options, direct)!;
		expect(check.countsAdvice).toEqual(advice);
		expect(advice.totalCounts).toBeGreaterThan(result.totalCounts);
		expect(advice.power).toBeGreaterThanOrEqual(0.9);
	});

	it('are what the planner answers with that check as its model, for those who may read it', async () => {
		const check = await getCheck(ctx.database, asUser(ada), checkId);
		const plan = await planFromCheck(ctx.database, asUser(ada), checkId, undefined, '192.0.2.1');
		expect(plan).toMatchObject({ model: 'check', method: 'mub-correlation', schmidtNumber: 5 });
		expect(plan.counts).toEqual(check.countsAdvice);
		expect(plan.visibility).toBe(check.result!.effectiveVisibility);
		// §7: η*_r = (B_r/m − 1/d)/(1 − 1/d) with B_4 = 1 + 4/5, m = 2, d = 5.
		expect(plan.criticalVisibility).toBeCloseTo((1.8 / 2 - 0.2) / 0.8, 12);
		const lower = await planFromCheck(ctx.database, asUser(ada), checkId, 2, '192.0.2.1');
		expect(lower.counts).toBeNull();
		expect(lower.note).toMatch(/already certifies Schmidt number 2/);
		await expect(
			planFromCheck(ctx.database, asUser(cyd), checkId, undefined, '192.0.2.2')
		).rejects.toBeInstanceOf(NotFoundError);
	});
});
