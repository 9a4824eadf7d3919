/**
 * A fidelity-target claim's calibration run through the web edge (witnesses.md §4.3′, §9) on a real
 * SQLite file: the API (multipart part `targetRun`, or a raw text/csv body) and the claim page's
 * `targetRun` form action; refusals name the field, and nothing is stored for a refused run.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { isActionFailure, isRedirect } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { UserActor } from '../../src/lib/server/core/actor';
import { TARGET_EXAMPLE, targetCountsCsv } from '../target-counts';
import { asUser } from './actors';
import { addGroup, addUser, claimFields } from './backend-fixtures';

vi.setConfig({ testTimeout: 300_000, hookTimeout: 300_000 });

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-target-run-api-'));
process.env.RANKSEAL_DATA_DIR = folder;
process.env.MAIL_CATCHER_PORT = '0';

const { app, stopApp } = await import('../../src/lib/server/app/app');
const { createClaim } = await import('../../src/lib/server/claims/claims');
const { addDataset } = await import('../../src/lib/server/datasets/datasets');
const runApi = await import('../../src/routes/api/v1/claims/[id]/target-run/+server');
const claimPage = await import('../../src/routes/(app)/claims/[id]/+page.server');

const { d, raw, v } = TARGET_EXAMPLE;
const counts = targetCountsCsv(raw, v, 1e6);
const run = targetCountsCsv(raw, v, 2e5)
	.split('\n')
	.filter((row) => !row.startsWith('1,'))
	.join('\n');

let author: UserActor;
let outsider: UserActor;

const runClaim = async () => {
	const { database } = await app();
	const fields = { ...claimFields, dimension: d, method: 'fidelity-target' };
	return createClaim(database, author, {
		...fields,
		claimedSchmidtNumber: 2,
		targetFrom: 'calibration-run'
	} as Parameters<typeof createClaim>[2]);
};

const event = (id: string, body: BodyInit, kind: 'api' | 'page', who = author, type?: string) => {
	const base = kind === 'api' ? `/api/v1/claims/${id}/target-run` : `/claims/${id}`;
	const url = new URL(`http://localhost${base}?name=run-7.csv`);
	const headers = type ? { 'content-type': type } : undefined;
	const request = new Request(url, { method: 'POST', body, headers });
	const locals = { actor: who, user: null, session: null };
	return { locals, url, params: { id }, request, setHeaders: () => {} } as never;
};

const form = (text: string) => {
	const body = new FormData();
	body.append('targetRun', new Blob([text]), 'run-7.csv');
	return body;
};

const stored = async (id: string) => {
	const { database } = await app();
	return (await database.models.Claim.findByPk(id))!.get({ plain: true });
};

beforeAll(async () => {
	const { database } = await app();
	const lake = await addGroup(database, 'Halvorsen Lake Photonics');
	const ridge = await addGroup(database, 'Ridge qudits');
	author = asUser(await addUser(database, 'Ada Lind', [[lake, 'author']]));
	outsider = asUser(await addUser(database, 'Cyd Marsh', [[ridge, 'lead']]));
});
afterAll(async () => {
	await stopApp();
	rmSync(folder, { recursive: true, force: true });
});

describe('the calibration run on the API', () => {
	it('takes a multipart run, answers the claim with λ frozen, and then 409', async () => {
		const claim = await runClaim();
		const answer = (await runApi.POST(event(claim.id, form(run), 'api'))) as Response;
		expect(answer.status).toBe(201);
		const body = await answer.json();
		expect(body.targetFrom).toBe('calibration-run');
		expect(body.targetRun).toMatchObject({ name: 'run-7.csv', diagonal: expect.any(Array) });
		expect(body.target.coefficients).toHaveLength(d);
		const again = (await runApi.POST(event(claim.id, form(run), 'api'))) as Response;
		expect(again.status).toBe(409);
	});

	it('takes a raw text/csv body named by ?name=', async () => {
		const claim = await runClaim();
		const answer = (await runApi.POST(event(claim.id, run, 'api', author, 'text/csv'))) as Response;
		expect(answer.status).toBe(201);
		expect((await answer.json()).targetRun.name).toBe('run-7.csv');
	});

	it('refuses the certified counts as the run, naming the field, and stores nothing', async () => {
		const claim = await runClaim();
		const { database } = await app();
		await addDataset(database, author, claim.id, {
			bytes: new TextEncoder().encode(counts),
			originalName: 'pixels.csv'
		});
		const answer = (await runApi.POST(event(claim.id, form(counts), 'api'))) as Response;
		expect(answer.status).toBe(400);
		const { error } = await answer.json();
		expect(error).toMatchObject({ code: 'bad_input', field: 'targetRun' });
		expect(error.message).toMatch(/very counts being certified.*pixels\.csv/);
		expect((await stored(claim.id)).targetRunSha256).toBeNull();
	});

	it('hides the claim from another group (404) and refuses anonymous callers (401)', async () => {
		const claim = await runClaim();
		const hidden = (await runApi.POST(event(claim.id, form(run), 'api', outsider))) as Response;
		expect(hidden.status).toBe(404);
		const anonymous = { kind: 'anonymous' } as never;
		const refused = (await runApi.POST(event(claim.id, form(run), 'api', anonymous))) as Response;
		expect(refused.status).toBe(401);
		expect((await stored(claim.id)).targetRunSha256).toBeNull();
	});
});

describe('the calibration run on the claim page', () => {
	it('fits λ from the form and redirects to the claim', async () => {
		const claim = await runClaim();
		const outcome = await Promise.resolve()
			.then(() => claimPage.actions.targetRun(event(claim.id, form(run), 'page')))
			.catch((thrown: unknown) => thrown);
		expect(isRedirect(outcome)).toBe(true);
		expect((outcome as { location: string }).location).toBe(`/claims/${claim.id}`);
		expect((await stored(claim.id)).targetRunName).toBe('run-7.csv');
	});

	it('shows a bad run beside the field, by line', async () => {
		const claim = await runClaim();
		const outcome = await claimPage.actions.targetRun(
			event(claim.id, form('basis,outcome_a,outcome_b,counts\n0,0,0,x\n'), 'page')
		);
		expect(isActionFailure(outcome)).toBe(true);
		const data = (outcome as { data: { errors: Record<string, string> } }).data;
		expect(data.errors.targetRun).toMatch(/line 2/);
		expect((await stored(claim.id)).targetRunSha256).toBeNull();
	});
});
