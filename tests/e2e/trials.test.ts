/**
 * Time-ordered trials through the built app (issue 20, slice 1): a claim declaring its trials
 * mode and setting probabilities over the JSON API, a gzip upload, the check on the worker pool,
 * `GET /api/v1/checks/{id}` and the check page as a signed-in browser receives it.
 */
import { rmSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
	certifyTrials,
	isotropicTrialsCsv,
	parseTrials,
	TRIALS_LABEL
} from '../../src/lib/certify/trials';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { seedApiWorld, type ApiWorld } from './api-world';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: ApiWorld;
const csv = isotropicTrialsCsv(5, 0.9, [0, 1], 2000, 3);

function call(route: string, init: RequestInit = {}) {
	const headers = new Headers(init.headers);
	headers.set('authorization', `Bearer ${world.tokens.lake}`);
	return fetch(app.origin + route, { ...init, headers });
}

async function trialsCheck(bytes: Uint8Array, name: string) {
	const claim = await (
		await call('/api/v1/claims', {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({
				title: 'Time-bin pairs in time order',
				sourceDescription: 'Halvorsen Lake Photonics, simulated run',
				dimension: 5,
				method: 'mub-correlation',
				bases: [0, 1],
				claimedSchmidtNumber: 3,
				trialsMode: 'trials',
				trialsProbabilities: [0.5, 0.5]
			})
		})
	).json();
	expect(claim.trials).toEqual({ mode: 'trials', probabilities: [0.5, 0.5] });
	const form = new FormData();
	form.set('counts', new Blob([bytes as BlobPart]), name);
	const uploaded = await call(`/api/v1/claims/${claim.id}/datasets`, {
		method: 'POST',
		body: form
	});
	expect(uploaded.status, await uploaded.clone().text()).toBe(201);
	const started = await call(`/api/v1/claims/${claim.id}/checks`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: '{}'
	});
	expect(started.status).toBe(202);
	let check = await started.json();
	// Polled as a script would; only the runner's timeout bounds the wait.
	while (check.status !== 'done' && check.status !== 'failed') {
		await new Promise((wait) => setTimeout(wait, 100));
		check = await (await call(`/api/v1/checks/${check.id}`)).json();
	}
	const page = await fetch(`${app.origin}/claims/${claim.id}/checks/${check.id}`, {
		headers: { cookie: `rankseal_session=${world.session}` }
	});
	return { check, claimId: claim.id as string, page: await page.text() };
}

beforeAll(async () => {
	world = await seedApiWorld();
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

describe('time-ordered trials in the app', () => {
	it('answers the supermartingale result over the API and shows p_r, label, i.i.d. comparison and the plot', async () => {
		const plain = new TextEncoder().encode(csv);
		const { check, page } = await trialsCheck(gzipSync(plain), 'run.csv.gz');
		expect(check.status, check.error).toBe('done');
		const expected = certifyTrials(parseTrials(plain, 5, 'trials'), {
			method: 'mub-correlation',
			bases: [0, 1],
			probabilities: [0.5, 0.5],
			fourier: 'cyclic',
			confidence: check.confidence,
			inputSha256: sha256Hex(gzipSync(plain))
		});
		expect(check.result).toEqual(JSON.parse(JSON.stringify(expected)));
		expect(check.result.label).toBe(TRIALS_LABEL);
		expect(page).toContain(TRIALS_LABEL);
		expect(page).toContain('data-testid="martingale-chart"');
		expect(page).toContain('<polyline');
		for (const rung of expected.rungs) expect(page).toContain(`data-rung="${rung.rung}"`);
		expect(page).toContain(`data-testid="trials-certified">${expected.certifiedSchmidtNumber}<`);
		const iid = expected.iid as { certifiedSchmidtNumber: number };
		expect(page).toMatch(
			new RegExp(`data-testid="trials-iid"[^>]*>\\s*≥ ${iid.certifiedSchmidtNumber}`)
		);
		// At visibility 0.9 in d = 5 the last rung is within reach of more trials (engine says how many).
		expect(expected.next?.unitsNeeded).toBeGreaterThan(0);
		expect(page).toContain(`about ${expected.next!.unitsNeeded!.toLocaleString('en')} trials`);
		// A trials check is certified like any other (issue 20, part 2): the page offers it.
		expect(page).toContain('data-testid="issue-certificate"');
	});

	it('issues its certificate over the API; the JSON, the certificate page and /seal state the kind and assumption', async () => {
		const { check, claimId } = await trialsCheck(new TextEncoder().encode(csv), 'run.csv');
		const issued = await call(`/api/v1/claims/${claimId}/certificates`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ checkId: check.id })
		});
		expect(issued.status, await issued.clone().text()).toBe(201);
		const certificate = await issued.json();
		expect(certificate).toMatchObject({
			kind: 'time-ordered-trials',
			certifiedSchmidtNumber: check.result.certifiedSchmidtNumber
		});
		expect(certificate.assumption).toMatch(/independently of the source and of the past/);
		const cookie = { cookie: `rankseal_session=${world.session}` };
		const own = await (
			await fetch(`${app.origin}/claims/${claimId}/certificates/${certificate.id}`, {
				headers: cookie
			})
		).text();
		expect(own).toMatch(/data-testid="certificate-kind"[^>]*>\s*Time-ordered trials/);
		const seal = await (await fetch(`${app.origin}/seal/${certificate.id}`)).text();
		expect(seal).toMatch(/data-testid="seal-kind"[^>]*>\s*Time-ordered trials/);
		expect(seal).toContain('independently of the source and of the past');
	});

	it('refuses settings in a predictable order on the page, with the settings check’s message', async () => {
		const rows = csv.trim().split('\n').slice(1);
		const alternating = rows.map((row, i) => row.replace(/^\d+/, String(i % 2)));
		const text = ['basis,outcome_a,outcome_b', ...alternating].join('\n') + '\n';
		const { check, page } = await trialsCheck(new TextEncoder().encode(text), 'alternating.csv');
		expect(check.result.certifiedSchmidtNumber).toBe(1);
		expect(page).toContain('data-testid="trials-settings"');
		expect(page).toContain('Nothing is certified: the settings do not look random.');
		expect(page).toContain('change 1999 times');
	});

	it('takes the trials mode and probabilities from the new-claim form, and names a bad field', async () => {
		const post = (fields: Record<string, string>) =>
			fetch(`${app.origin}/claims/new?/create`, {
				method: 'POST',
				redirect: 'manual',
				headers: {
					cookie: `rankseal_session=${world.session}`,
					origin: app.origin,
					accept: 'text/html',
					'content-type': 'application/x-www-form-urlencoded'
				},
				body: new URLSearchParams({
					title: 'Blocks of one setting',
					sourceDescription: 'Halvorsen Lake Photonics, block run',
					dimension: '5',
					method: 'mub-correlation',
					bases: '0, 1',
					claimedSchmidtNumber: '2',
					...fields
				})
			});
		const made = await post({ trialsMode: 'blocks', trialsProbabilities: '0.25, 0.75' });
		expect(made.status).toBe(303);
		const claimId = made.headers.get('location')!.split('/').pop();
		const claim = await (await call(`/api/v1/claims/${claimId}`)).json();
		expect(claim.trials).toEqual({ mode: 'blocks', probabilities: [0.25, 0.75] });
		const claimPage = await (
			await fetch(`${app.origin}/claims/${claimId}`, {
				headers: { cookie: `rankseal_session=${world.session}` }
			})
		).text();
		expect(claimPage).toContain('accept=".csv,.gz,.txt,text/csv,application/gzip"');
		expect(claimPage).toMatch(
			/data-testid="claim-trials"[^>]*>\s*time-ordered trials, one bet per block; setting probabilities 0.25, 0.75/
		);
		const bad = await post({ trialsMode: 'trials', trialsProbabilities: '0.5, 0.6' });
		expect(bad.status).toBe(400);
		expect(await bad.text()).toContain('The setting probabilities must sum to 1');
	});
});
