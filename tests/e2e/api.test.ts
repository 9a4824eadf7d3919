/** The JSON API of the built app, driven with bearer tokens as a script would. */
import { rmSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { certify, parseCounts, sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { seedApiWorld, servedEndpoints, type ApiWorld } from './api-world';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: ApiWorld;
const csv = toCountsCsv(sampledCounts(states.isotropic(5, 0.9), [0, 1, 2], 80_000, 11), [
	'simulated'
]);
const ids = { claim: '', dataset: '', check: '' };

function call(route: string, init: RequestInit & { token?: string | null } = {}) {
	const headers = new Headers(init.headers);
	const token = init.token === undefined ? world.tokens.lake : init.token;
	if (token) headers.set('authorization', `Bearer ${token}`);
	return fetch(app.origin + route, { ...init, headers });
}
const sendJson = (route: string, body: unknown, token?: string) =>
	call(route, {
		method: 'POST',
		token,
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify(body)
	});

const claimBody = {
	title: 'Frequency-bin pairs',
	sourceDescription: 'Simulated, visibility 0.9',
	dimension: 5,
	method: 'mub-correlation',
	bases: [0, 1, 2],
	claimedSchmidtNumber: 3
};

beforeAll(async () => {
	world = await seedApiWorld();
	app = await startApp({
		RANKSEAL_DATA_DIR: world.dataDir,
		RANKSEAL_DEMO: '0',
		MAIL_CATCHER_PORT: '0',
		BODY_SIZE_LIMIT: '25M'
	});
});
afterAll(async () => {
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
});

describe('API v1', () => {
	it('answers 401 in the error shape without credentials or with a revoked or expired token', async () => {
		for (const token of [null, world.tokens.revoked, world.tokens.expired, 'rks_made_up']) {
			const response = await call('/api/v1/claims', { token });
			expect(response.status).toBe(401);
			expect((await response.json()).error.code).toBe('unauthorised');
		}
	});

	it('creates a claim (201) and refuses a bad one naming the fields (400)', async () => {
		const created = await sendJson('/api/v1/claims', claimBody);
		expect(created.status).toBe(201);
		const claim = await created.json();
		expect(claim).toMatchObject({
			title: 'Frequency-bin pairs',
			state: 'draft',
			bases: [0, 1, 2],
			groupName: 'Lake optics'
		});
		expect(created.headers.get('location')).toBe(`/api/v1/claims/${claim.id}`);
		ids.claim = claim.id;
		const bad = await sendJson('/api/v1/claims', {
			...claimBody,
			title: '',
			bases: [0, 9],
			claimedSchmidtNumber: 6
		});
		expect(bad.status).toBe(400);
		const { error } = await bad.json();
		expect(error.code).toBe('bad_input');
		expect(error.message).toMatch(/title: .*claimedSchmidtNumber: .*bases: Basis 9 does not exist/);
	});

	it('takes counts as a raw CSV body and refuses a bad file with its line', async () => {
		const route = `/api/v1/claims/${ids.claim}/datasets`;
		const csvBody = (body: string) => ({
			method: 'POST',
			headers: { 'content-type': 'text/csv' },
			body
		});
		const raw = await call(`${route}?name=run-1.csv`, csvBody(csv));
		expect(raw.status).toBe(201);
		const dataset = await raw.json();
		expect(dataset).toMatchObject({
			originalName: 'run-1.csv',
			format: 'csv',
			summary: { dimension: 5, bases: [0, 1, 2] }
		});
		ids.dataset = dataset.id;
		const bad = await call(route, csvBody(csv.replace('\n0,1,1,', '\n0,1,7,')));
		expect(bad.status).toBe(400);
		expect((await bad.json()).error).toMatchObject({
			code: 'bad_counts',
			line: 9,
			message: expect.stringMatching(/^line 9, column 3: outcome_b 7 is outside 0..4/)
		});
		expect((await (await call(route)).json()).map((d: { id: string }) => d.id)).toEqual([
			dataset.id
		]);
	});

	it('takes counts as the multipart field "counts" from a script (no Origin header)', async () => {
		// Other bytes than the raw upload's (a comment line), which the claim already holds.
		const bytes = `# sent as multipart\n${csv}`;
		const send = (name: string) => {
			const form = new FormData();
			form.set('counts', new Blob([bytes], { type: 'text/csv' }), name);
			return call(route, { method: 'POST', body: form });
		};
		const route = `/api/v1/claims/${ids.claim}/datasets`;
		const multipart = await send('run-1b.csv');
		expect(multipart.status, await multipart.clone().text()).toBe(201);
		const dataset = await multipart.json();
		expect(dataset).toMatchObject({ originalName: 'run-1b.csv', format: 'csv' });
		const listed = await (await call(route)).json();
		expect(listed.map((d: { sha256: string }) => d.sha256)[0]).toBe(dataset.sha256);
		expect(listed).toHaveLength(2);
		// The same bytes again: 409, naming the earlier upload.
		const again = await send('run-1c.csv');
		expect(again.status).toBe(409);
		expect((await again.json()).error).toMatchObject({ code: 'conflict' });
		expect(await (await call(route)).json()).toHaveLength(2);
	});

	it('refuses other media types (415) and files over the limit (413)', async () => {
		const route = `/api/v1/claims/${ids.claim}/datasets`;
		const xml = await call(route, {
			method: 'POST',
			headers: { 'content-type': 'application/xml' },
			body: '<counts/>'
		});
		expect(xml.status).toBe(415);
		const huge = await call(route, {
			method: 'POST',
			headers: { 'content-type': 'text/csv' },
			body: new Uint8Array(21 * 1024 * 1024).fill(48)
		});
		expect(huge.status).toBe(413);
		expect((await huge.json()).error.code).toBe('too_large');
	});

	it('queues a check (202) that finishes with the engine’s result for the same seed', async () => {
		const started = await sendJson(`/api/v1/claims/${ids.claim}/checks`, {
			resamples: 20_000,
			seed: 99
		});
		expect(started.status).toBe(202);
		const queued = await started.json();
		const [newest] = await (await call(`/api/v1/claims/${ids.claim}/datasets`)).json();
		expect(queued).toMatchObject({ status: 'queued', datasetId: newest.id });
		ids.check = queued.id;
		let check = queued;
		const progress: number[] = [];
		// Polled as a script would; only the test runner's timeout bounds the wait, and nothing
		// asserted depends on which progress values happened to be seen.
		while (check.status !== 'done' && check.status !== 'failed') {
			await new Promise((wait) => setTimeout(wait, 100));
			check = await (await call(started.headers.get('location')!)).json();
			progress.push(check.progress);
		}
		expect(check).toMatchObject({ status: 'done', progress: 1, error: null });
		expect(progress).toEqual([...progress].sort((a, b) => a - b));
		const expected = certify(parseCounts(csv, 5), {
			method: 'mub-correlation',
			bases: [0, 1, 2],
			resamples: 20_000,
			seed: 99,
			claim: 3
		});
		for (const field of [
			'statistic',
			'bounds',
			'certifiedSchmidtNumber',
			'pointSchmidtNumber',
			'claim',
			'confidence',
			'resamples',
			'seed',
			'effectiveVisibility',
			'totalCounts'
		] as const) {
			expect(check.result[field], field).toEqual(JSON.parse(JSON.stringify(expected[field])));
		}
		expect(check.result.inputSha256).toBe(newest.sha256);
		const claim = await (await call(`/api/v1/claims/${ids.claim}`)).json();
		expect(claim).toMatchObject({
			state: 'checked',
			latestCheck: { id: ids.check, status: 'done' }
		});
	});

	it('lists with search, filter, sort and pages; a session cookie works too', async () => {
		await sendJson('/api/v1/claims', {
			...claimBody,
			title: 'Another source',
			method: 'steering-2mub',
			bases: [0, 1]
		});
		const page = await (await call('/api/v1/claims?sort=title&order=asc&pageSize=1&page=2')).json();
		expect(page).toMatchObject({
			total: 2,
			page: 2,
			pageSize: 1,
			items: [{ title: 'Frequency-bin pairs' }]
		});
		const found = await (await call('/api/v1/claims?q=another&method=steering-2mub')).json();
		expect(found.items.map((c: { title: string }) => c.title)).toEqual(['Another source']);
		const bySession = await call('/api/v1/claims?state=checked', {
			token: null,
			headers: { cookie: `rankseal_session=${world.session}` }
		});
		expect(bySession.status).toBe(200);
		expect((await bySession.json()).total).toBe(1);
	});

	it('answers 404, never 403, for another group’s claim, datasets and check', async () => {
		const ridge = world.tokens.ridge;
		const attempts = [
			call(`/api/v1/claims/${ids.claim}`, { token: ridge }),
			call(`/api/v1/claims/${ids.claim}/datasets`, { token: ridge }),
			call(`/api/v1/claims/${ids.claim}/datasets`, {
				token: ridge,
				method: 'POST',
				headers: { 'content-type': 'text/csv' },
				body: csv
			}),
			sendJson(`/api/v1/claims/${ids.claim}/checks`, {}, ridge),
			call(`/api/v1/checks/${ids.check}`, { token: ridge })
		];
		for (const response of await Promise.all(attempts)) {
			expect(response.status).toBe(404);
			expect((await response.json()).error.code).toBe('not_found');
		}
		expect((await (await call('/api/v1/claims', { token: ridge })).json()).total).toBe(0);
	});

	it('describes exactly the endpoints it serves in openapi.json', async () => {
		const doc = await (await call('/api/v1/openapi.json', { token: null })).json();
		expect(doc.openapi).toBe('3.1.0');
		expect(Object.keys(doc.components.securitySchemes).sort()).toEqual([
			'bearerToken',
			'sessionCookie'
		]);
		const documented = Object.entries(doc.paths as Record<string, object>).flatMap(([p, ops]) =>
			Object.keys(ops).map((m) => `${m.toUpperCase()} ${p}`)
		);
		expect(documented.sort()).toEqual(servedEndpoints().sort());
		const issued = await sendJson(`/api/v1/claims/${ids.claim}/certificates`, {
			checkId: ids.check
		});
		expect(issued.status).toBe(201);
		const certificate = (await issued.json()).id;
		const idFor = (template: string) =>
			template.startsWith('/api/v1/checks/')
				? ids.check
				: template.startsWith('/api/v1/certificates/')
					? certificate
					: ids.claim;
		for (const endpoint of documented) {
			const [method, template] = endpoint.split(' ');
			const route = template.replace('{id}', idFor(template)).replace('{datasetId}', ids.dataset);
			const response = await call(route, {
				method,
				headers: { 'content-type': 'application/json' },
				body: method === 'GET' ? undefined : '{}'
			});
			// Shares, review links, reports and review tokens are not in this world: such a route must
			// exist (no 405) and answers 404 for an id or token it does not know.
			const foreign = /\/(shares|review-links|reports|review)\//.test(template);
			expect(foreign ? [405] : [404, 405], `${endpoint} → ${response.status}`).not.toContain(
				response.status
			);
		}
		expect((await call(`/api/v1/claims/${ids.claim}`, { method: 'DELETE' })).status).toBe(405);
	});

	it('takes and returns the Fourier convention (default cyclic), refusing field in d = 6', async () => {
		expect((await (await call(`/api/v1/claims/${ids.claim}`)).json()).fourier).toBe('cyclic');
		const created = await sendJson('/api/v1/claims', {
			...claimBody,
			dimension: 9,
			bases: [0, 1, 2, 3],
			fourier: 'field'
		});
		expect(created.status).toBe(201);
		const claim = await created.json();
		expect(claim).toMatchObject({ fourier: 'field', bases: [0, 1, 2, 3] });
		expect((await (await call(`/api/v1/claims/${claim.id}`)).json()).fourier).toBe('field');
		const six = await sendJson('/api/v1/claims', { ...claimBody, dimension: 6, fourier: 'field' });
		expect(six.status).toBe(400);
		expect((await six.json()).error.message).toMatch(/fourier: .*prime-power dimension/);
	});
});
