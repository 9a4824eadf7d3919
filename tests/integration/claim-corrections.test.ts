/**
 * What a new user tripped over (issue 7 §4–§5), against a real SQLite file and the real worker
 * threads: correcting a claim and taking back a file before the first check, the dimension
 * named on a mismatch, background subtraction as a check option, and pages that show a stored
 * dataset without parsing it again.
 */
import { existsSync, renameSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError, sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { stopCheckRunner } from '../../src/lib/server/checks/registry';
import { updateClaim } from '../../src/lib/server/claims/claim-edit';
import { getCheck, startCheck } from '../../src/lib/server/checks/checks';
import { createClaim, getClaim } from '../../src/lib/server/claims/claims';
import { removeDataset } from '../../src/lib/server/datasets/dataset-removal';
import { addDataset, datasetTables, listDatasets } from '../../src/lib/server/datasets/datasets';
import { datasetFilePath } from '../../src/lib/server/storage/counts-store';
import {
	ConflictError,
	FieldError,
	ForbiddenError,
	NotFoundError
} from '../../src/lib/server/core/errors';
import type { Actor } from '../../src/lib/server/core/actor';
import { asUser } from './actors';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { temporaryDatabase } from './db';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let ada: Actor, bo: Actor, lena: Actor, cyd: Actor;

beforeAll(async () => {
	ctx = await temporaryDatabase();
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	const lake = await addGroup(ctx.database, 'Lake optics');
	const ridge = await addGroup(ctx.database, 'Ridge qudits');
	ada = asUser(await addUser(ctx.database, 'Ada Lind', [[lake, 'author']]));
	bo = asUser(await addUser(ctx.database, 'Bo Strand', [[lake, 'author']]));
	lena = asUser(await addUser(ctx.database, 'Lena Holm', [[lake, 'lead']]));
	cyd = asUser(await addUser(ctx.database, 'Cyd Marsh', [[ridge, 'lead']]));
});
afterAll(async () => {
	await stopCheckRunner(ctx.database);
	await ctx.close();
});

const upload = (actor: Actor, claimId: string, text: string, name = 'counts.csv') =>
	addDataset(ctx.database, actor, claimId, { bytes: bytesOf(text), originalName: name });

async function finished(actor: Actor, checkId: string) {
	await stopCheckRunner(ctx.database);
	return getCheck(ctx.database, actor, checkId);
}

describe('correcting a claim before its first check', () => {
	it('lets the author and a lead change every field, audited, until a check runs', async () => {
		const { id } = await createClaim(ctx.database, ada, claimFields);
		const corrected = await updateClaim(ctx.database, ada, id, {
			...claimFields,
			title: 'Time-bin pairs, run 4',
			dimension: 7,
			method: 'steering-2mub',
			claimedSchmidtNumber: 5,
			manuscriptReference: 'submission 118'
		});
		expect(corrected).toMatchObject({
			title: 'Time-bin pairs, run 4',
			dimension: 7,
			method: 'steering-2mub',
			bases: [0, 1],
			claimedSchmidtNumber: 5,
			manuscriptReference: 'submission 118'
		});
		await updateClaim(ctx.database, lena, id, { ...claimFields, dimension: 7 });
		await expect(updateClaim(ctx.database, bo, id, claimFields)).rejects.toBeInstanceOf(
			ForbiddenError
		);
		await expect(updateClaim(ctx.database, cyd, id, claimFields)).rejects.toBeInstanceOf(
			NotFoundError
		);
		const audits = await ctx.database.models.AuditEvent.count({
			where: { subjectId: id, action: 'claim.edited' }
		});
		expect(audits).toBe(2);

		await upload(ada, id, countsCsv(7, [0, 1]));
		// A file of another dimension would no longer fit the claim.
		await expect(updateClaim(ctx.database, ada, id, claimFields)).rejects.toMatchObject({
			field: 'dimension'
		});
		// The file was read with the cyclic convention (7 is prime, so field is allowed as such).
		await expect(
			updateClaim(ctx.database, ada, id, { ...claimFields, dimension: 7, fourier: 'field' })
		).rejects.toMatchObject({ field: 'fourier' });
		const check = await startCheck(ctx.database, ada, id, { resamples: 200 });
		await finished(ada, check.id);
		const error = await updateClaim(ctx.database, ada, id, { ...claimFields, dimension: 7 }).catch(
			(e) => e
		);
		expect(error).toBeInstanceOf(ConflictError);
		expect((await getClaim(ctx.database, ada, id)).dimension).toBe(7);
	});
});

describe('taking back an upload', () => {
	it('removes an unchecked file with its bytes and an audit event, and keeps a checked one', async () => {
		const { id } = await createClaim(ctx.database, ada, claimFields);
		const wrong = await upload(ada, id, countsCsv(5, [0, 1], 40_000, 3), 'wrong.csv');
		await expect(removeDataset(ctx.database, cyd, id, wrong.id)).rejects.toBeInstanceOf(
			NotFoundError
		);
		await removeDataset(ctx.database, bo, id, wrong.id);
		expect(await listDatasets(ctx.database, ada, id)).toEqual([]);
		expect(existsSync(datasetFilePath(wrong.sha256))).toBe(false);
		const audit = await ctx.database.models.AuditEvent.findOne({
			where: { subjectId: wrong.id, action: 'dataset.removed' }
		});
		expect(audit?.get('details')).toMatchObject({ originalName: 'wrong.csv' });
		// Once removed, the same bytes may be uploaded again.
		const right = await upload(ada, id, countsCsv(5, [0, 1], 40_000, 3), 'right.csv');
		const check = await startCheck(ctx.database, ada, id, { resamples: 200 });
		await finished(ada, check.id);
		await expect(removeDataset(ctx.database, ada, id, right.id)).rejects.toBeInstanceOf(
			ConflictError
		);
		expect(existsSync(datasetFilePath(right.sha256))).toBe(true);
	});
});

describe('a file of another dimension', () => {
	it('says "the file is d = 5, the claim is d = 11" for CSV and JSON alike', async () => {
		const { id } = await createClaim(ctx.database, ada, { ...claimFields, dimension: 11 });
		const csv = countsCsv(5, [0, 1]);
		const tables = [0, 1].map((basis) => ({
			basis,
			counts: Array.from({ length: 5 }, (_, a) =>
				Array.from({ length: 5 }, (_, b) => (a === b ? 90 : 2))
			)
		}));
		const json = JSON.stringify({ dimension: 5, tables });
		for (const text of [csv, json]) {
			const error = await upload(ada, id, text).catch((e) => e);
			expect(error).toBeInstanceOf(InputError);
			expect(error.message).toBe('the file is d = 5, the claim is d = 11');
		}
	});
});

describe('background subtraction as a check option', () => {
	it('refuses without an accidentals column and labels the result when it subtracts', async () => {
		const { id } = await createClaim(ctx.database, ada, claimFields);
		const plain = await upload(ada, id, countsCsv(5, [0, 1], 40_000, 5), 'plain.csv');
		const error = await startCheck(ctx.database, ada, id, {
			datasetId: plain.id,
			subtractAccidentals: true
		}).catch((e) => e);
		expect(error).toBeInstanceOf(FieldError);
		expect(error.field).toBe('subtractAccidentals');
		expect(error.message).toMatch(/accidentals column, and plain\.csv has none/);

		// Two accidental counts per cell, written as the product's optional column.
		const data = sampledCounts(states.isotropic(5, 0.9), [0, 1], 40_000, 8);
		const withAccidentals = toCountsCsv(data)
			.replace('basis,outcome_a,outcome_b,counts', 'basis,outcome_a,outcome_b,counts,accidentals')
			.replace(/^(\d+,\d+,\d+,\d+)$/gm, '$1,2');
		const background = await upload(ada, id, withAccidentals, 'with-accidentals.csv');
		expect(background.summary.hasAccidentals).toBe(true);
		const check = await startCheck(ctx.database, ada, id, {
			datasetId: background.id,
			subtractAccidentals: true,
			// Per-cell draws: at least ⌈2/α⌉ = 1 482 resamples at 0.99865 (engine 3.0.0).
			resamples: 1500
		});
		expect(check.subtractAccidentals).toBe(true);
		const done = await finished(ada, check.id);
		expect(done.status).toBe('done');
		expect(done.result?.backgroundSubtracted).toBe(true);
	});
});

describe('a page view does not parse the file', () => {
	it('serves the heat-map tables stored at upload, and fills them in once for older rows', async () => {
		const { id } = await createClaim(ctx.database, ada, claimFields);
		const dataset = await upload(ada, id, countsCsv(5, [0, 1], 40_000, 21));
		const file = datasetFilePath(dataset.sha256);
		// With the bytes out of reach, only stored tables can answer.
		renameSync(file, `${file}.away`);
		try {
			const tables = (await datasetTables(ctx.database, ada, dataset.id))!;
			expect(tables.tables.map((t) => t.basis)).toEqual([0, 1]);
			expect(tables.tables[0].total).toBe(dataset.summary.totals['0']);
		} finally {
			renameSync(`${file}.away`, file);
		}
		// A row from before migration 0004 has no stored tables: read once, then kept.
		await ctx.database.models.Dataset.update({ preview: null }, { where: { id: dataset.id } });
		const filled = (await datasetTables(ctx.database, ada, dataset.id))!;
		expect(filled.tables[1].counts).toHaveLength(5);
		const row = (await ctx.database.models.Dataset.findByPk(dataset.id))!;
		expect(row.get('preview')).toEqual(filled.tables);
	});
});
