/**
 * A claim's Fourier convention (issue 6 §5) through the services: stored and returned, checked
 * against the upload's own declaration, and used by the check the runner performs.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ZodError } from 'zod';
import {
	certify,
	expectedCounts,
	InputError,
	parseCounts,
	states,
	toCountsCsv
} from '../../src/lib/certify';
import { startCheckRunner } from '../../src/lib/server/checks/registry';
import { getCheck, startCheck } from '../../src/lib/server/checks/checks';
import { createClaim, getClaim } from '../../src/lib/server/claims/claims';
import { addDataset, listDatasets } from '../../src/lib/server/datasets/datasets';
import { addGroup, addUser, bytesOf, claimFields } from './backend-fixtures';
import { asUser } from './actors';
import { workerDatabase, type WorkerDatabase } from './worker-database';

let ctx: WorkerDatabase;
let ada: string;

/**
 * A d = 9 JSON counts file measured in the field bases, optionally declaring a convention. Extra
 * counts in cells (1,0) and (3,2) fall in one cyclic class (a − b = 1) but in two field classes
 * ((0,1) − (2,0) = (1,1) digit-wise), so the two pairings give different bounds.
 */
function fieldJson(declared: 'cyclic' | 'field' | null): string {
	const data = expectedCounts(states.isotropic(9, 0.85), [0, 1], 200_000, 'field');
	data.tables[0].counts[1 * 9 + 0] += 5000;
	data.tables[0].counts[3 * 9 + 2] += 5000;
	const tables = data.tables.map((t) => ({
		basis: t.basis,
		counts: Array.from({ length: 9 }, (_, a) => Array.from(t.counts.subarray(a * 9, a * 9 + 9)))
	}));
	return JSON.stringify(
		declared ? { dimension: 9, fourier: declared, tables } : { dimension: 9, tables }
	);
}

beforeAll(async () => {
	ctx = await workerDatabase();
	const lake = await addGroup(ctx.database, 'Lake optics');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'author']]);
});
afterAll(async () => {
	await ctx.close();
});

describe('the Fourier convention of a claim', () => {
	it('defaults to cyclic, stores field when asked, and returns it', async () => {
		const plain = await createClaim(ctx.database, asUser(ada), { ...claimFields, dimension: 9 });
		expect(plain.fourier).toBe('cyclic');
		const field = await createClaim(ctx.database, asUser(ada), {
			...claimFields,
			dimension: 9,
			bases: [0, 1, 2],
			fourier: 'field'
		});
		expect(field).toMatchObject({ fourier: 'field', bases: [0, 1, 2] });
		expect((await getClaim(ctx.database, asUser(ada), field.id))?.fourier).toBe('field');
	});

	it('refuses bases 2..d in d = 9 under cyclic, and field where d is not a prime power', async () => {
		const cyclic = createClaim(ctx.database, asUser(ada), {
			...claimFields,
			dimension: 9,
			bases: [0, 1, 2]
		});
		await expect(cyclic).rejects.toThrow(ZodError);
		await expect(cyclic).rejects.toThrow(/basis 2 in d = 9 exists only with fourier=field/i);
		const six = createClaim(ctx.database, asUser(ada), {
			...claimFields,
			dimension: 6,
			fourier: 'field'
		});
		await expect(six).rejects.toThrow(/prime-power dimension/);
		const bad = createClaim(ctx.database, asUser(ada), { ...claimFields, fourier: 'dft' });
		await expect(bad).rejects.toThrow(/Fourier convention must be cyclic or field/);
	});

	it('refuses, storing nothing, counts that declare a different convention', async () => {
		const claim = await createClaim(ctx.database, asUser(ada), {
			...claimFields,
			dimension: 9,
			method: 'fidelity-two-basis'
		});
		const upload = addDataset(ctx.database, asUser(ada), claim.id, {
			bytes: bytesOf(fieldJson('field')),
			originalName: 'field.json'
		});
		await expect(upload).rejects.toThrow(InputError);
		await expect(upload).rejects.toThrow(/\$\.fourier: the file declares "field" but the claim/);
		expect(await listDatasets(ctx.database, asUser(ada), claim.id)).toEqual([]);
	});

	it('is what the check runs with: field pairing for a field claim in d = 9', async () => {
		const claim = await createClaim(ctx.database, asUser(ada), {
			...claimFields,
			dimension: 9,
			method: 'fidelity-two-basis',
			fourier: 'field',
			claimedSchmidtNumber: 7
		});
		const bytes = bytesOf(fieldJson(null));
		await addDataset(ctx.database, asUser(ada), claim.id, { bytes, originalName: 'run.json' });
		const queued = await startCheck(ctx.database, asUser(ada), claim.id, {
			resamples: 2000,
			seed: 5
		});
		await (await startCheckRunner(ctx.database)).idle();
		const check = (await getCheck(ctx.database, asUser(ada), queued.id))!;
		expect(check.status).toBe('done');
		const run = (fourier: 'cyclic' | 'field') =>
			certify(parseCounts(bytes, 9), {
				method: 'fidelity-two-basis',
				fourier,
				resamples: 2000,
				seed: 5,
				claim: 7
			});
		expect(check.result!.fourier).toBe('field');
		expect(check.result!.statistic).toEqual(JSON.parse(JSON.stringify(run('field').statistic)));
		// The cyclic pairing of the same counts gives another value: the convention was used.
		expect(run('cyclic').statistic.plugInValue).not.toBeCloseTo(
			check.result!.statistic.plugInValue!,
			3
		);
	});

	it('CSV counts carry no declaration and are taken in the claim’s convention', async () => {
		const claim = await createClaim(ctx.database, asUser(ada), {
			...claimFields,
			dimension: 9,
			bases: [0, 1, 2, 3],
			fourier: 'field'
		});
		const csv = toCountsCsv(expectedCounts(states.isotropic(9, 0.9), [0, 1, 2, 3], 1e5, 'field'));
		const dataset = await addDataset(ctx.database, asUser(ada), claim.id, {
			bytes: bytesOf(csv),
			originalName: 'four.csv'
		});
		expect(dataset.summary.allows).toContain('mub-correlation');
	});
});
