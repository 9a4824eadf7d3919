/**
 * Several counts files in one upload (issue 18) on a real SQLite file: one d × d grid per basis
 * with its basis given beside it, or full files, become one dataset with one canonical counts
 * SHA-256 — through the dataset service, the API and the claim page's form action. A bad second
 * file is refused naming the file and its own line and column, and nothing is stored.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { isActionFailure, isRedirect } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import {
	MAX_COUNTS_FILE_BYTES,
	parseCounts,
	sampledCounts,
	states,
	toCountsCsv
} from '../../src/lib/certify';
import { splitCountsSet } from '../../src/lib/certify/counts-set';
import { canonicalCountsText } from '../../src/lib/evidence/manifest';
import type { UserActor } from '../../src/lib/server/core/actor';
import { problemOf } from '../../src/lib/server/http/problems';
import { asUser } from './actors';
import { addGroup, addUser, claimFields } from './backend-fixtures';

vi.setConfig({ testTimeout: 300_000, hookTimeout: 300_000 });

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-counts-files-'));
process.env.RANKSEAL_DATA_DIR = folder;
process.env.MAIL_CATCHER_PORT = '0';

const { app, stopApp } = await import('../../src/lib/server/app/app');
const { config } = await import('../../src/lib/server/core/config');
const { createClaim } = await import('../../src/lib/server/claims/claims');
const { datasetFilePath } = await import('../../src/lib/server/storage/counts-store');
const { addCountsFiles } = await import('../../src/lib/server/datasets/counts-files');
const datasetsApi = await import('../../src/routes/api/v1/claims/[id]/datasets/+server');
const claimPage = await import('../../src/routes/(app)/claims/[id]/+page.server');

const d = 5;
const counts = sampledCounts(states.isotropic(d, 0.9), [0, 1, 2], 30_000, 17);
const sha256 = (bytes: Uint8Array | string) => createHash('sha256').update(bytes).digest('hex');

/** Basis t as a lab saves it: one bare grid, no basis line. */
const grid = (t: number, sep: string) =>
	Array.from({ length: d }, (_, a) =>
		Array.from({ length: d }, (_, b) => counts.tables[t].counts[a * d + b]).join(sep)
	).join('\n') + '\n';
const files = [
	{ name: 'h-basis.tsv', text: grid(0, '\t'), basis: '0' },
	{ name: 'fourier.tsv', text: grid(1, '\t'), basis: '1' },
	{ name: 'third.csv', text: toCountsCsv({ ...counts, tables: [counts.tables[2]] }), basis: '' }
];
/** Line 3, column 2 of the second file no longer holds a number. */
const typo = files[1].text.split('\n');
typo[2] = typo[2].replace(/^(\d+)\t/, '$1\tx');
const badSecond = [files[0], { ...files[1], text: typo.join('\n') }, files[2]];

const canonicalSha = sha256(canonicalCountsText(parseCounts(toCountsCsv(counts), d)));

let author: UserActor;
let claimId: string;

beforeAll(async () => {
	const { database } = await app();
	const lake = await addGroup(database, 'Halvorsen Lake Photonics');
	author = asUser(await addUser(database, 'Ada Lind', [[lake, 'lead']]));
	claimId = (await createClaim(database, author, claimFields)).id;
});
afterAll(async () => {
	await stopApp();
	rmSync(folder, { recursive: true, force: true });
});

/** Rows, audit events and stored files: what an upload leaves behind. */
async function stored() {
	const { database } = await app();
	const dir = config().filesDir;
	const onDisk = existsSync(dir) ? readdirSync(dir, { recursive: true }).map(String) : [];
	return {
		rows: await database.models.Dataset.count(),
		audit: await database.models.AuditEvent.count(),
		files: onDisk.filter((f) => /^[0-9a-f]{64}$/.test(path.basename(f))).length
	};
}

function form(parts: typeof files, withBases = true): FormData {
	const body = new FormData();
	for (const f of parts) body.append('counts', new Blob([f.text]), f.name);
	if (withBases) for (const f of parts) body.append('basis', f.basis);
	return body;
}

const event = (id: string, body: FormData, kind: 'api' | 'page') => {
	const url = new URL(
		kind === 'api'
			? `http://localhost/api/v1/claims/${id}/datasets`
			: `http://localhost/claims/${id}`
	);
	const request = new Request(url, { method: 'POST', body });
	const locals = { actor: author, user: null, session: null };
	return { locals, url, params: { id }, request, setHeaders: () => {} } as never;
};

async function refusal(run: () => Promise<unknown>) {
	try {
		await run();
	} catch (error) {
		return problemOf(error);
	}
	throw new Error('expected a refusal');
}

describe('the dataset service', () => {
	it('joins two grids with their bases and a long-form file into one dataset', async () => {
		const { database } = await app();
		const upload = files.map((f) => ({
			name: f.name,
			bytes: new TextEncoder().encode(f.text),
			basis: f.basis === '' ? null : Number(f.basis)
		}));
		const view = await addCountsFiles(database, author, claimId, { files: upload });
		expect(view.summary.bases).toEqual([0, 1, 2]);
		expect(view.originalName).toBe('h-basis.tsv + fourier.tsv + third.csv');
		expect(view.summary.readAs).toMatch(
			/^read as 3 files — h-basis\.tsv: 1 grid of 5 × 5 in basis 0/
		);
		const row = (await database.models.Dataset.findByPk(view.id))!.get({ plain: true });
		// One canonical identity: the same counts as one long-form file would have.
		expect(row.countsSha256).toBe(canonicalSha);
		const bytes = readFileSync(datasetFilePath(view.sha256));
		expect(sha256(bytes)).toBe(view.sha256);
		const kept = splitCountsSet(bytes);
		kept.forEach((f, i) => expect(sha256(f.bytes)).toBe(sha256(files[i].text)));
	});

	it('refuses a bad second file naming it and its line, storing nothing', async () => {
		const { database } = await app();
		const before = await stored();
		const upload = badSecond.map((f) => ({
			name: f.name,
			bytes: new TextEncoder().encode(f.text),
			basis: f.basis === '' ? null : Number(f.basis)
		}));
		const problem = await refusal(() =>
			addCountsFiles(database, author, claimId, { files: upload })
		);
		expect(problem).toMatchObject({ status: 400, code: 'bad_counts', line: 3, column: 2 });
		expect(problem!.message).toMatch(/^line 3, column 2: in fourier\.tsv \(file 2 of 3\): counts/);
		expect(await stored()).toEqual(before);
	});

	it('stores a single file without a basis exactly as uploaded, as before', async () => {
		const { database } = await app();
		const text = toCountsCsv(counts);
		const bytes = new TextEncoder().encode(text);
		const view = await addCountsFiles(database, author, claimId, {
			files: [{ name: 'run.csv', bytes, basis: null }]
		});
		expect(view.sha256).toBe(sha256(text));
		expect(view.originalName).toBe('run.csv');
	});
});

describe('a claim on time-ordered trials', () => {
	it('takes one trials file per upload: several files or a basis are refused by field', async () => {
		const { database } = await app();
		const trials = await createClaim(database, author, { ...claimFields, trialsMode: 'trials' });
		const file = (name: string, basis: number | null) => ({
			name,
			bytes: new TextEncoder().encode('basis,outcome_a,outcome_b\n0,1,1\n'),
			basis
		});
		const before = await stored();
		const two = await refusal(() =>
			addCountsFiles(database, author, trials.id, {
				files: [file('a.csv', null), file('b.csv', null)]
			})
		);
		expect(two).toMatchObject({ status: 400, code: 'bad_input', field: 'counts' });
		const withBasis = await refusal(() =>
			addCountsFiles(database, author, trials.id, { files: [file('a.csv', 0)] })
		);
		expect(withBasis).toMatchObject({ status: 400, field: 'basis' });
		expect(await stored()).toEqual(before);
	});
});

describe('the API', () => {
	it('takes several counts parts with a basis part each and answers 201 with one dataset', async () => {
		const other = (await createClaim((await app()).database, author, claimFields)).id;
		const answer = (await datasetsApi.POST(event(other, form(files), 'api'))) as Response;
		expect(answer.status).toBe(201);
		const body = await answer.json();
		expect(body.summary.bases).toEqual([0, 1, 2]);
		const { database } = await app();
		const row = (await database.models.Dataset.findByPk(body.id))!.get({ plain: true });
		expect(row.countsSha256).toBe(canonicalSha);
	});

	it('answers 400 naming the file and line for a bad second file, and storing nothing', async () => {
		const before = await stored();
		const answer = (await datasetsApi.POST(event(claimId, form(badSecond), 'api'))) as Response;
		expect(answer.status).toBe(400);
		const body = await answer.json();
		expect(body.error).toMatchObject({ code: 'bad_counts', line: 3, column: 2 });
		expect(body.error.message).toContain('in fourier.tsv (file 2 of 3)');
		expect(await stored()).toEqual(before);
	});

	it('reads a raw text/csv grid as the basis ?basis= gives (the claim then lacks its others)', async () => {
		const before = await stored();
		const url = `http://localhost/api/v1/claims/${claimId}/datasets?basis=1&name=v.tsv`;
		const request = new Request(url, {
			method: 'POST',
			body: files[1].text,
			headers: { 'content-type': 'text/csv' }
		});
		const locals = { actor: author, user: null, session: null };
		const raw = { locals, url: new URL(url), params: { id: claimId }, request } as never;
		const answer = (await datasetsApi.POST(raw)) as Response;
		expect(answer.status).toBe(400);
		// Read as basis 1, so it is the claim's basis 0 that is missing, not the grid's basis line.
		expect((await answer.json()).error).toMatchObject({
			code: 'bad_counts',
			message: 'method mub-correlation needs basis 0, which the file does not contain'
		});
		expect(await stored()).toEqual(before);
	});

	it('answers 413 when the files together pass the one-file limit', async () => {
		const half = new Uint8Array(MAX_COUNTS_FILE_BYTES / 2 + 1).fill(0x30);
		const body = new FormData();
		body.append('counts', new Blob([half]), 'a.tsv');
		body.append('counts', new Blob([half]), 'b.tsv');
		const answer = (await datasetsApi.POST(event(claimId, body, 'api'))) as Response;
		expect(answer.status).toBe(413);
		expect((await answer.json()).error.code).toBe('too_large');
	});

	it('answers 400 naming the field basis when the bases do not pair with the files', async () => {
		const body = form(files, false);
		body.append('basis', '0');
		const answer = (await datasetsApi.POST(event(claimId, body, 'api'))) as Response;
		expect(answer.status).toBe(400);
		expect((await answer.json()).error).toMatchObject({ code: 'bad_input', field: 'basis' });
	});
});

describe('the claim page form', () => {
	it('stores two grids and a full file as one dataset and goes to its preview', async () => {
		const other = (await createClaim((await app()).database, author, claimFields)).id;
		const upload = async () => claimPage.actions.upload(event(other, form(files), 'page'));
		const thrown = await upload().catch((e: unknown) => e);
		expect(isRedirect(thrown)).toBe(true);
		expect((thrown as { location: string }).location).toMatch(
			new RegExp(`^/claims/${other}\\?dataset=.+#preview$`)
		);
	});

	it('fails with the line and the file named, echoing the files chosen, storing nothing', async () => {
		const before = await stored();
		const answer = await claimPage.actions.upload(event(claimId, form(badSecond), 'page'));
		expect(isActionFailure(answer)).toBe(true);
		const data = (answer as unknown as { data: unknown }).data as {
			errors: Record<string, string>;
			values: Record<string, string>;
			place: { line: number; column: number };
		};
		expect(data.place).toEqual({ line: 3, column: 2 });
		expect(Object.values(data.errors).join(' ')).toContain('in fourier.tsv (file 2 of 3)');
		expect(data.values.counts).toBe('h-basis.tsv, fourier.tsv, third.csv');
		expect(await stored()).toEqual(before);
	});
});
