/**
 * Hostile counts files through the parser and the datasets service: a thousand generated
 * malformed files (hostile-counts.ts) each get a refusal that says where the problem is and maps
 * to a 4xx answer, and none leaves a dataset row or a stored file behind.
 */
import { existsSync, readdirSync } from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError, parseCounts } from '../../src/lib/certify';
import { stopCheckRunner } from '../../src/lib/server/checks/registry';
import { problemOf } from '../../src/lib/server/http/problems';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { asUser } from './actors';
import { addGroup, addUser, claimFields } from './backend-fixtures';
import { temporaryDatabase } from './db';
import { BASES, D, GOOD_CSV, hostileCounts, NAMES_THE_PLACE } from './hostile-counts';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let author: string, claimId: string;

function storedFiles(): string[] {
	const root = path.join(ctx.folder, 'files');
	if (!existsSync(root)) return [];
	return readdirSync(root, { recursive: true, encoding: 'utf8' });
}

beforeAll(async () => {
	ctx = await temporaryDatabase();
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	const lake = await addGroup(ctx.database, 'Lake optics');
	author = await addUser(ctx.database, 'Ada Lind', [[lake, 'author']]);
	const fields = { ...claimFields, dimension: D, bases: BASES };
	claimId = (await createClaim(ctx.database, asUser(author), fields)).id;
});
afterAll(async () => {
	await stopCheckRunner(ctx.database);
	await ctx.close();
});

describe('hostile counts files', () => {
	it('starts from a good file, which the parser and the service accept', async () => {
		expect(parseCounts(GOOD_CSV, D).dimension).toBe(D);
		const bytes = new TextEncoder().encode(GOOD_CSV);
		await addDataset(ctx.database, asUser(author), claimId, { bytes, originalName: 'good.csv' });
	});

	it('refuses 1 000 generated malformed files in the parser, saying where', () => {
		fc.assert(
			fc.property(hostileCounts, ({ kind, bytes }) => {
				let refusal: unknown = null;
				try {
					parseCounts(bytes, D);
				} catch (error) {
					refusal = error;
				}
				expect(refusal, `${kind} was accepted`).toBeInstanceOf(InputError);
				expect((refusal as Error).message, kind).toMatch(NAMES_THE_PLACE);
			}),
			{ numRuns: 1000, seed: 20261202 }
		);
	});

	it('refuses 400 of them in the datasets service with a 400, storing nothing', async () => {
		const rows = await ctx.database.models.Dataset.count();
		const files = storedFiles();
		for (const { kind, bytes } of fc.sample(hostileCounts, { numRuns: 400, seed: 77 })) {
			const upload = { bytes, originalName: `${kind}.csv` };
			const refusal = await addDataset(ctx.database, asUser(author), claimId, upload).then(
				() => null,
				(error: unknown) => error
			);
			const problem = problemOf(refusal);
			expect(problem?.status, `${kind}: ${String(refusal)}`).toBe(400);
			expect(problem?.message, kind).toMatch(NAMES_THE_PLACE);
		}
		expect(await ctx.database.models.Dataset.count()).toBe(rows);
		expect(storedFiles()).toEqual(files);
	}, 300_000);

	it('names the line of the first byte that is not UTF-8', () => {
		const lines = GOOD_CSV.split('\n');
		for (const at of [0, 6, lines.length - 2]) {
			const before = new TextEncoder().encode(lines.slice(0, at).join('\n') + (at ? '\n' : ''));
			const after = new TextEncoder().encode(lines.slice(at).join('\n'));
			// 0xC3 opens a two-byte sequence that "(" does not continue (RFC 3629 §4).
			const bytes = new Uint8Array(Buffer.concat([before, Uint8Array.of(0xc3, 0x28), after]));
			expect(() => parseCounts(bytes, D)).toThrow(`line ${at + 1}: not valid UTF-8 text`);
		}
		const cutShort = new Uint8Array(
			Buffer.concat([new TextEncoder().encode(GOOD_CSV), Uint8Array.of(0xe2, 0x82)])
		);
		expect(() => parseCounts(cutShort, D)).toThrow(`line ${lines.length}: not valid UTF-8`);
	});
});
