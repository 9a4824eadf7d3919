/**
 * Claims on time-ordered trials end to end (issue 20, slice 1): a real SQLite file in a temporary
 * folder, the upload read on the bundled worker, the check run on the same pool as every check.
 * Expected numbers come from the engine called directly (its own tests tie it to witnesses.md §10).
 */
import { gzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
	BLOCKS_CONDITION,
	certifyTrials,
	isotropicTrialsCsv,
	mulberry32,
	parseTrials,
	TRIALS_LABEL,
	type TrialsResult
} from '../../src/lib/certify/trials';
import { claimInputSchema } from '../../src/lib/claims/schema';
import { startCheckRunner } from '../../src/lib/server/checks/registry';
import { getCheck, startCheck } from '../../src/lib/server/checks/checks';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { createClaim, getClaim } from '../../src/lib/server/claims/claims';
import { updateClaim } from '../../src/lib/server/claims/claim-edit';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { addGroup, addUser, bytesOf, claimFields } from './backend-fixtures';
import { asUser } from './actors';
import { workerDatabase, type WorkerDatabase } from './worker-database';

let ctx: WorkerDatabase;
let ada: string;

const D = 5;
const csv = isotropicTrialsCsv(D, 0.95, [0, 1], 4000, 7);

async function trialsClaim(extra: Record<string, unknown> = {}) {
	const fields = { ...claimFields, dimension: D, claimedSchmidtNumber: 3 };
	return createClaim(ctx.database, asUser(ada), { ...fields, trialsMode: 'trials', ...extra });
}

async function finished(id: string) {
	await (await startCheckRunner(ctx.database)).idle();
	return (await getCheck(ctx.database, asUser(ada), id))!;
}

beforeAll(async () => {
	ctx = await workerDatabase();
	const lake = await addGroup(ctx.database, 'Halvorsen Lake Photonics');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'author']]);
});
afterAll(async () => {
	await ctx.close();
});

describe('claims on time-ordered trials', () => {
	it('keeps the mode and the declared probabilities; refuses probabilities that do not sum to 1', async () => {
		const claim = await trialsClaim({ trialsProbabilities: '0.25, 0.75' });
		expect(claim.trials).toEqual({ mode: 'trials', probabilities: [0.25, 0.75] });
		await expect(trialsClaim({ trialsProbabilities: [0.5, 0.6] })).rejects.toThrow(/must sum to 1/);
		await expect(trialsClaim({ method: 'fidelity-two-basis' })).rejects.toThrow(
			/Time-ordered trials work with/
		);
		// A validated claim (nulls for "not given") parses again unchanged, as the API's path does.
		const plain = claimInputSchema.parse({ ...claimFields });
		expect(claimInputSchema.parse(plain)).toEqual(plain);
		expect(plain).toMatchObject({ trialsMode: null, trialsProbabilities: null });
	});

	it('checks a gzip upload on the worker pool: p_r per rung, label, i.i.d. comparison, the engine’s exact numbers', async () => {
		const claim = await trialsClaim();
		const gz = gzipSync(bytesOf(csv));
		const dataset = await addDataset(ctx.database, asUser(ada), claim.id, {
			bytes: gz,
			originalName: 'run.csv.gz'
		});
		expect(dataset.summary.totals).toEqual({
			'0': expect.any(Number),
			'1': expect.any(Number)
		});
		expect(dataset.summary.totals['0'] + dataset.summary.totals['1']).toBe(4000);
		const queued = await startCheck(ctx.database, asUser(ada), claim.id, {});
		const check = await finished(queued.id);
		expect(check.status).toBe('done');
		const result = check.result as unknown as TrialsResult;
		const direct = certifyTrials(parseTrials(bytesOf(csv), D, 'trials'), {
			method: 'mub-correlation',
			bases: [0, 1],
			fourier: 'cyclic',
			confidence: check.confidence,
			inputSha256: dataset.sha256
		});
		expect(result).toEqual(JSON.parse(JSON.stringify(direct)));
		expect(result.label).toBe(TRIALS_LABEL);
		expect(result.rungs.map((r) => r.rung)).toEqual([1, 2, 3, 4]);
		expect(result.certifiedSchmidtNumber).toBeGreaterThan(1);
		expect('certifiedSchmidtNumber' in result.iid).toBe(true);
		expect((await getClaim(ctx.database, asUser(ada), claim.id)).latestCheck).toMatchObject({
			status: 'done',
			certifiedSchmidtNumber: result.certifiedSchmidtNumber
		});
		// The certificate of this kind (trials-certificates.test.ts covers its files and verifier).
		const certificate = await issueCertificate(ctx.database, asUser(ada), claim.id, check.id);
		expect(certificate).toMatchObject({
			kind: 'time-ordered-trials',
			certifiedSchmidtNumber: result.certifiedSchmidtNumber
		});
	});

	it('refuses settings in a predictable order with the settings check’s message, certifying nothing', async () => {
		const claim = await trialsClaim();
		const rows = csv.trim().split('\n').slice(1);
		const alternating = rows.map((row, i) => row.replace(/^\d+/, String(i % 2)));
		const text = ['basis,outcome_a,outcome_b', ...alternating].join('\n') + '\n';
		await addDataset(ctx.database, asUser(ada), claim.id, {
			bytes: bytesOf(text),
			originalName: 'alternating.csv'
		});
		const check = await finished((await startCheck(ctx.database, asUser(ada), claim.id, {})).id);
		const result = check.result as unknown as TrialsResult;
		expect(result.settings.passed).toBe(false);
		expect(result.settings.message).toMatch(/change 3999 times/);
		expect(result.certifiedSchmidtNumber).toBe(1);
	});

	it('keeps an edited trials claim within the trials rules (method, one probability per basis)', async () => {
		const claim = await trialsClaim({ trialsProbabilities: [0.5, 0.5] });
		const fields = { ...claimFields, dimension: D, claimedSchmidtNumber: 3 };
		await expect(
			updateClaim(ctx.database, asUser(ada), claim.id, { ...fields, method: 'fidelity-two-basis' })
		).rejects.toThrow(/Time-ordered trials work with/);
		await expect(
			updateClaim(ctx.database, asUser(ada), claim.id, { ...fields, bases: [0, 1, 2] })
		).rejects.toThrow(/one setting probability per basis/);
		const edited = await updateClaim(ctx.database, asUser(ada), claim.id, {
			...fields,
			title: 'Renamed run'
		});
		expect(edited.trials).toEqual({ mode: 'trials', probabilities: [0.5, 0.5] });
	});

	it('checks blocks under the declared probabilities, one bet per block, with the blocks condition', async () => {
		const claim = await trialsClaim({ trialsMode: 'blocks', trialsProbabilities: [0.25, 0.75] });
		const random = mulberry32(11);
		const rows = ['basis,outcome_a,outcome_b,block'];
		for (let block = 0; block < 300; block++) {
			const basis = random() < 0.25 ? 0 : 1;
			for (let i = 0; i < 20; i++) {
				const a = Math.floor(random() * D);
				const b = random() < 0.9 ? a : Math.floor(random() * D);
				rows.push(`${basis},${a},${b},${block}`);
			}
		}
		const text = rows.join('\n') + '\n';
		const dataset = await addDataset(ctx.database, asUser(ada), claim.id, {
			bytes: bytesOf(text),
			originalName: 'blocks.csv'
		});
		const check = await finished((await startCheck(ctx.database, asUser(ada), claim.id, {})).id);
		const result = check.result as unknown as TrialsResult;
		const direct = certifyTrials(parseTrials(bytesOf(text), D, 'blocks'), {
			method: 'mub-correlation',
			bases: [0, 1],
			probabilities: [0.25, 0.75],
			fourier: 'cyclic',
			confidence: check.confidence,
			inputSha256: dataset.sha256
		});
		expect(result).toEqual(JSON.parse(JSON.stringify(direct)));
		expect(result).toMatchObject({ mode: 'blocks', blocks: 300, condition: BLOCKS_CONDITION });
		expect(result.probabilities).toEqual([0.25, 0.75]);
		expect(result.settings.passed).toBe(true);
	});

	it('names the line of a bad row and stores nothing', async () => {
		const claim = await trialsClaim();
		const bad = 'basis,outcome_a,outcome_b\n0,1,1\n0,9,1\n';
		await expect(
			addDataset(ctx.database, asUser(ada), claim.id, {
				bytes: bytesOf(bad),
				originalName: 'x.csv'
			})
		).rejects.toThrow(/line 3/);
		expect(await ctx.database.models.Dataset.count({ where: { claimId: claim.id } })).toBe(0);
	});
});
