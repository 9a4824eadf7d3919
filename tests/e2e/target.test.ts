/**
 * fidelity-target through the built app (witnesses.md §4.3′): a claim declaring λ over the JSON
 * API, the counts (basis 0 computational, basis 1 tilted) uploaded, the check on the worker pool,
 * the check and claim pages as a signed-in browser receives them, the method page, the planner's
 * refusal, the certificate (it carries λ) and a referee's re-run from a review link (exact limits: a
 * fresh seed gives the same numbers). Expected numbers: the engine called directly.
 */
import { rmSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseCounts } from '../../src/lib/certify';
import { certifyTarget } from '../../src/lib/certify/fidelity-target';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { newId, newSecret } from '../../src/lib/server/core/ids';
import { openDatabase } from '../../src/lib/server/db';
import { TARGET_EXAMPLE, targetCountsCsv } from '../target-counts';
import { seedApiWorld, type ApiWorld } from './api-world';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: ApiWorld;
let editorToken: string;
let certifiedClaimId: string;
const EDITOR_EMAIL = 'harriet.vell@journal.example';
const csv = targetCountsCsv(TARGET_EXAMPLE.raw, TARGET_EXAMPLE.v, 1e6);
const bytes = new TextEncoder().encode(csv);

function call(route: string, init: RequestInit = {}) {
	const headers = new Headers(init.headers);
	headers.set('authorization', `Bearer ${world.tokens.lake}`);
	return fetch(app.origin + route, { ...init, headers });
}
const json = (body: unknown) => ({
	method: 'POST',
	headers: { 'content-type': 'application/json' },
	body: JSON.stringify(body)
});
const page = async (route: string) =>
	(
		await fetch(app.origin + route, { headers: { cookie: `rankseal_session=${world.session}` } })
	).text();

/** An editor with an API token, written into the data folder before the app starts. */
async function seedEditor(dataDir: string): Promise<string> {
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	const userId = newId();
	await database.models.User.create({
		id: userId,
		email: EDITOR_EMAIL,
		name: 'Harriet Vell',
		passwordHash: 'unused',
		accountRole: 'editor',
		emailVerifiedAt: new Date()
	});
	const { token, hash } = newSecret('rks_');
	const prefix = token.slice(0, 12);
	await database.models.ApiToken.create({
		id: newId(),
		userId,
		name: 'e2e',
		prefix,
		tokenHash: hash
	});
	await database.sequelize.close();
	return token;
}

beforeAll(async () => {
	world = await seedApiWorld();
	editorToken = await seedEditor(world.dataDir);
	app = await startApp({
		RANKSEAL_DATA_DIR: world.dataDir,
		RANKSEAL_DEMO: '0',
		MAIL_CATCHER_PORT: '0'
	});
});
afterAll(async () => {
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
});

describe('fidelity-target in the app', () => {
	it('takes λ over the API, checks on the pool, shows F̃, bound, ladder and caution; issues its certificate', async () => {
		const created = await call(
			'/api/v1/claims',
			json({
				title: 'Pixel pairs against a declared target',
				sourceDescription: 'Halvorsen Lake Photonics, simulated run',
				dimension: 3,
				method: 'fidelity-target',
				claimedSchmidtNumber: 2,
				target: TARGET_EXAMPLE.raw
			})
		);
		expect(created.status, await created.clone().text()).toBe(201);
		const claim = await created.json();
		expect(claim.target.declared).toEqual(TARGET_EXAMPLE.raw);
		const form = new FormData();
		form.set('counts', new Blob([bytes as BlobPart]), 'pixels.csv');
		const uploaded = await call(`/api/v1/claims/${claim.id}/datasets`, {
			method: 'POST',
			body: form
		});
		expect(uploaded.status, await uploaded.clone().text()).toBe(201);
		const started = await call(`/api/v1/claims/${claim.id}/checks`, json({}));
		expect(started.status).toBe(202);
		let check = await started.json();
		// Polled as a script would; only the runner's timeout bounds the wait.
		while (check.status !== 'done' && check.status !== 'failed') {
			await new Promise((wait) => setTimeout(wait, 100));
			check = await (await call(`/api/v1/checks/${check.id}`)).json();
		}
		expect(check.status, check.error).toBe('done');
		const direct = certifyTarget(parseCounts(bytes, 3), {
			target: claim.target.coefficients,
			confidence: check.confidence,
			claim: 2,
			inputSha256: sha256Hex(bytes)
		});
		expect(check.result.statistic).toEqual(JSON.parse(JSON.stringify(direct.statistic)));
		expect(check.result.certifiedSchmidtNumber).toBe(2);
		const html = await page(`/claims/${claim.id}/checks/${check.id}`);
		expect(html).toContain('data-testid="target-certified">2<');
		expect(html).toContain(direct.statistic.lower.toFixed(5));
		expect(html).toContain('not fitted on these counts');
		expect(html).toContain('--method fidelity-target --target');
		expect(html).toContain('data-testid="issue-certificate"');
		expect(await page(`/claims/${claim.id}`)).toContain('data-testid="claim-target"');
		const issued = await call(
			`/api/v1/claims/${claim.id}/certificates`,
			json({ checkId: check.id })
		);
		expect(issued.status).toBe(201);
		expect(await issued.json()).toMatchObject({ certifiedSchmidtNumber: 2, status: 'valid' });
		certifiedClaimId = claim.id;
	});

	it('a referee re-runs it from a review link with a fresh seed: identical, and the page says the seed plays no part', async () => {
		const shared = await call(
			`/api/v1/claims/${certifiedClaimId}/shares`,
			json({ email: EDITOR_EMAIL, journal: 'Journal of Invented Optics', manuscript: 'JIO-7' })
		);
		expect(shared.status, await shared.clone().text()).toBe(201);
		const link = await fetch(`${app.origin}/api/v1/claims/${certifiedClaimId}/review-links`, {
			...json({}),
			headers: { 'content-type': 'application/json', authorization: `Bearer ${editorToken}` }
		});
		expect(link.status, await link.clone().text()).toBe(201);
		const reviewPath = new URL((await link.json()).url).pathname;
		const api = `${app.origin}/api/v1${reviewPath}`;
		const started = await fetch(`${api}/checks`, json({ seed: 4242 }));
		expect(started.status, await started.clone().text()).toBe(202);
		let rerun = await started.json();
		// Polled as a script would; only the runner's timeout bounds the wait.
		while (rerun.status !== 'done' && rerun.status !== 'failed') {
			await new Promise((wait) => setTimeout(wait, 100));
			rerun = await (await fetch(`${api}/checks/${rerun.id}`)).json();
		}
		expect(rerun.comparison).toEqual({
			sameSeed: false,
			identical: true,
			withinError: true,
			firstDifference: null,
			engines: null
		});
		// The review page as a referee's browser (no cookies) receives it.
		const html = (await (await fetch(app.origin + reviewPath)).text()).replace(/<!--[^]*?-->/g, '');
		expect(html).toMatch(/Seed 4242\s+\(plays no part in this check\)/);
		expect(html).toContain('Identical to the certificate, number for number.');
		expect(html).not.toContain('data-testid="rerun-difference"');
	});

	it('lists the method on /methods, explains it on its page, and the planner API plans it with λ', async () => {
		expect(await page('/methods')).toContain('href="/methods/fidelity-target"');
		const method = await fetch(`${app.origin}/methods/fidelity-target?d=3`);
		expect(method.status).toBe(200);
		expect(await method.text()).toContain('never fitted on the counts');
		const plan = await call(
			'/api/v1/plan?method=fidelity-target&dimension=3&schmidtNumber=2&visibility=0.9'
		);
		expect(plan.status).toBe(400);
		expect(await plan.text()).toMatch(/declared target λ/);
		const planned = await call(
			'/api/v1/plan?method=fidelity-target&target=0.863,0.485,0.143&schmidtNumber=2&visibility=0.9'
		);
		expect(planned.status).toBe(200);
		expect((await planned.json()).pairsNeeded).toBeGreaterThan(0);
	});

	it('makes a fidelity-target claim from the new-claim form and saves its edit form', async () => {
		const post = async (route: string, fields: Record<string, string>) =>
			(
				await fetch(app.origin + route, {
					method: 'POST',
					headers: {
						cookie: `rankseal_session=${world.session}`,
						origin: app.origin,
						'content-type': 'application/x-www-form-urlencoded'
					},
					body: new URLSearchParams(fields)
				})
			).json();
		const fields = {
			title: 'Pixel pairs from the form',
			sourceDescription: 'simulated',
			dimension: '3',
			method: 'fidelity-target',
			bases: '',
			fourier: 'cyclic',
			claimedSchmidtNumber: '2',
			manuscriptReference: ''
		};
		// Without an HTML accept header SvelteKit answers an action as JSON: redirect or failure.
		const made = await post('/claims/new?/create', { ...fields, target: '0.863, 0.485, 0.143' });
		expect(made).toMatchObject({ type: 'redirect', status: 303 });
		const at = made.location as string;
		expect(await page(at)).toContain('data-testid="claim-target"');
		const missing = await post('/claims/new?/create', fields);
		expect(missing).toMatchObject({ type: 'failure', status: 400 });
		expect(JSON.stringify(missing)).toContain('Declare the target');
		const saved = await post(`${at}/edit?/save`, { ...fields, title: 'Renamed in the form' });
		expect(saved, JSON.stringify(saved)).toMatchObject({ type: 'redirect', status: 303 });
		expect(await page(at)).toContain('Renamed in the form');
	});
});
