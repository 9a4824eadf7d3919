import { existsSync, readdirSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/lib/certify';
import { createClaim } from '../../src/lib/server/claims/claims';
import {
	addDataset,
	datasetTables,
	getDataset,
	listDatasets
} from '../../src/lib/server/datasets/datasets';
import { datasetFilePath } from '../../src/lib/server/storage/counts-store';
import { stopCheckRunner } from '../../src/lib/server/checks/registry';
import { ConflictError, NotFoundError } from '../../src/lib/server/core/errors';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { asUser } from './actors';
import { temporaryDatabase } from './db';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let ada: string, cyd: string, claimId: string;
const csv = countsCsv();

/** Every stored counts file under the data folder. */
function storedFiles(): string[] {
	const root = path.join(ctx.folder, 'files');
	if (!existsSync(root)) return [];
	return readdirSync(root, { recursive: true, withFileTypes: true })
		.filter((e) => e.isFile())
		.map((e) => e.name);
}

beforeAll(async () => {
	ctx = await temporaryDatabase();
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	const lake = await addGroup(ctx.database, 'Lake optics');
	const ridge = await addGroup(ctx.database, 'Ridge qudits');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'author']]);
	cyd = await addUser(ctx.database, 'Cyd Marsh', [[ridge, 'lead']]);
	claimId = (await createClaim(ctx.database, asUser(ada), claimFields)).id;
});
afterAll(async () => {
	await stopCheckRunner(ctx.database);
	await ctx.close();
});

describe('datasets service', () => {
	it('stores a good CSV under its SHA-256 with a summary of what it holds', async () => {
		const dataset = await addDataset(ctx.database, asUser(ada), claimId, {
			bytes: bytesOf(csv),
			originalName: 'run3.csv'
		});
		expect(dataset).toMatchObject({
			claimId,
			format: 'csv',
			originalName: 'run3.csv',
			byteSize: bytesOf(csv).byteLength
		});
		expect(dataset.sha256).toMatch(/^[0-9a-f]{64}$/);
		expect(dataset.summary).toMatchObject({
			dimension: 5,
			bases: [0, 1],
			hasAccidentals: false,
			hasDurations: false
		});
		expect(dataset.summary.allows.sort()).toEqual([
			'fidelity-two-basis',
			'mub-correlation',
			'steering-2mub'
		]);
		expect(Object.keys(dataset.summary.totals)).toEqual(['0', '1']);
		expect(path.relative(ctx.folder, datasetFilePath(dataset.sha256))).toBe(
			path.join('files', dataset.sha256.slice(0, 2), dataset.sha256)
		);
		expect(existsSync(datasetFilePath(dataset.sha256))).toBe(true);
		const audit = await ctx.database.models.AuditEvent.findOne({
			where: { subjectId: dataset.id }
		});
		expect(audit?.get('action')).toBe('dataset.added');
	});

	it('refuses the same bytes twice on one claim, naming the first upload', async () => {
		const error = await addDataset(ctx.database, asUser(ada), claimId, {
			bytes: bytesOf(csv),
			originalName: 'copy.csv'
		}).catch((e) => e);
		expect(error).toBeInstanceOf(ConflictError);
		expect(error.message).toMatch(
			/uploaded to this claim already, as run3\.csv on \d{1,2} [A-Z][a-z]+ \d{4}, \d\d:\d\d UTC\./
		);
		const all = await listDatasets(ctx.database, asUser(ada), claimId);
		expect(all.map((d) => d.originalName)).toEqual(['run3.csv']);
	});

	it('keeps identical bytes once on disk, with a row per claim', async () => {
		const before = storedFiles().length;
		const second = (await createClaim(ctx.database, asUser(ada), claimFields)).id;
		const again = await addDataset(ctx.database, asUser(ada), second, {
			bytes: bytesOf(csv),
			originalName: 'copy.csv'
		});
		expect(storedFiles().length).toBe(before);
		const [first] = await listDatasets(ctx.database, asUser(ada), claimId);
		expect(again.sha256).toBe(first.sha256);
	});

	it('accepts the JSON form and tells it apart by content', async () => {
		const d = 5;
		const table = (basis: number) => ({
			basis,
			counts: Array.from({ length: d }, (_, a) =>
				Array.from({ length: d }, (_, b) => (a === b ? 900 : 20 + a + b))
			)
		});
		const json = JSON.stringify({ dimension: d, tables: [table(0), table(1), table(2)] });
		const dataset = await addDataset(ctx.database, asUser(ada), claimId, {
			bytes: bytesOf(json),
			originalName: 'tables.json'
		});
		expect(dataset.format).toBe('json');
		expect(dataset.summary.bases).toEqual([0, 1, 2]);
		const total = table(2)
			.counts.flat()
			.reduce((sum, c) => sum + c, 0);
		expect(dataset.summary.totals['2']).toBe(total);
	});

	it('rejects a bad file with the line named, leaving no row and no file', async () => {
		const rowsBefore = await ctx.database.models.Dataset.count();
		const filesBefore = storedFiles().length;
		const bad = csv.replace(/\n0,0,2,(\d+)\n/, '\n0,0,2,lots\n');
		const error = await addDataset(ctx.database, asUser(ada), claimId, {
			bytes: bytesOf(bad),
			originalName: 'bad.csv'
		}).catch((e) => e);
		expect(error).toBeInstanceOf(InputError);
		expect(error.line).toBe(5);
		expect(error.message).toMatch(/^line 5, column 4: counts must be a non-negative whole number/);
		const smaller = countsCsv(3);
		await expect(
			addDataset(ctx.database, asUser(ada), claimId, {
				bytes: bytesOf(smaller),
				originalName: 'd3.csv'
			})
		).rejects.toThrow(/the file is d = 3, the claim is d = 5/);
		await expect(
			addDataset(ctx.database, asUser(ada), claimId, {
				bytes: new Uint8Array(0),
				originalName: 'empty.csv'
			})
		).rejects.toThrow(/empty/);
		expect(await ctx.database.models.Dataset.count()).toBe(rowsBefore);
		expect(storedFiles().length).toBe(filesBefore);
	});

	it('rejects a file that lacks a basis the claim uses', async () => {
		const onlyComputational = countsCsv(5, [0]);
		await expect(
			addDataset(ctx.database, asUser(ada), claimId, {
				bytes: bytesOf(onlyComputational),
				originalName: 'z.csv'
			})
		).rejects.toThrow(/needs basis 1, which the file does not contain/);
	});

	it('removes the file it wrote when the database write fails', async () => {
		const rowsBefore = await ctx.database.models.Dataset.count();
		const filesBefore = storedFiles();
		const fresh = countsCsv(5, [0, 1], 50_000, 99);
		await ctx.database.sequelize.query('ALTER TABLE audit_events RENAME TO audit_events_away');
		try {
			await expect(
				addDataset(ctx.database, asUser(ada), claimId, {
					bytes: bytesOf(fresh),
					originalName: 'x.csv'
				})
			).rejects.toThrow();
		} finally {
			await ctx.database.sequelize.query('ALTER TABLE audit_events_away RENAME TO audit_events');
		}
		expect(await ctx.database.models.Dataset.count()).toBe(rowsBefore);
		expect(storedFiles()).toEqual(filesBefore);
	});

	it('hides datasets of another group’s claim', async () => {
		const [dataset] = await listDatasets(ctx.database, asUser(ada), claimId);
		await expect(
			addDataset(ctx.database, asUser(cyd), claimId, { bytes: bytesOf(csv), originalName: 'x.csv' })
		).rejects.toBeInstanceOf(NotFoundError);
		await expect(listDatasets(ctx.database, asUser(cyd), claimId)).rejects.toBeInstanceOf(
			NotFoundError
		);
		await expect(getDataset(ctx.database, asUser(cyd), dataset.id)).rejects.toBeInstanceOf(
			NotFoundError
		);
		await expect(datasetTables(ctx.database, asUser(cyd), dataset.id)).rejects.toBeInstanceOf(
			NotFoundError
		);
		expect((await getDataset(ctx.database, asUser(ada), dataset.id))?.id).toBe(dataset.id);
	});

	it('gives the d×d tables per basis for heat maps', async () => {
		const [dataset] = await listDatasets(ctx.database, asUser(ada), claimId);
		const tables = (await datasetTables(ctx.database, asUser(ada), dataset.id))!;
		expect(tables.dimension).toBe(5);
		expect(tables.tables[0].counts).toHaveLength(5);
		expect(tables.tables[0].counts[0]).toHaveLength(5);
		expect(tables.tables[0].total).toBe(dataset.summary.totals[String(tables.tables[0].basis)]);
	});
});
