/**
 * Headers and requests (issue 10) against the built app: security headers on every kind of
 * answer, no caching of private ones, Secure cookies behind https, the origin check for any
 * unsafe request sent with a cookie, JSON content types and numbers, and 413 for bodies over the
 * limit whether or not they declare their length — with nothing stored from them.
 */
import { readdirSync, rmSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { seedApiWorld, type ApiWorld } from './api-world';
import { startApp, type AppServer } from './server';

const BODY_LIMIT = 1024 * 1024; // BODY_SIZE_LIMIT=1M, as adapter-node reads it
let app: AppServer;
let world: ApiWorld;
let claimId = '';
const csv = toCountsCsv(sampledCounts(states.isotropic(5, 0.9), [0, 1], 20_000, 3), ['simulated']);

const bearer = () => ({ authorization: `Bearer ${world.tokens.lake}` });
const cookie = () => ({ cookie: `rankseal_session=${world.session}` });
const call = (route: string, init: RequestInit = {}) => fetch(app.origin + route, init);
/** A body of `size` bytes sent in 64 KiB chunks with no Content-Length (chunked encoding). */
function chunked(size: number, fill = 0x30): { body: ReadableStream; duplex: 'half' } {
	let sent = 0;
	const body = new ReadableStream<Uint8Array>({
		pull(controller) {
			if (sent >= size) return controller.close();
			const part = new Uint8Array(Math.min(65_536, size - sent)).fill(fill);
			sent += part.length;
			controller.enqueue(part);
		}
	});
	return { body, duplex: 'half' };
}
const partFiles = () =>
	readdirSync(world.dataDir, { recursive: true, encoding: 'utf8' }).filter((f) =>
		f.endsWith('.part')
	);

beforeAll(async () => {
	world = await seedApiWorld();
	app = await startApp({
		RANKSEAL_DATA_DIR: world.dataDir,
		RANKSEAL_DEMO: '0',
		BODY_SIZE_LIMIT: '1M'
	});
	const claim = {
		title: 'Headers',
		sourceDescription: 'Simulated',
		dimension: 5,
		method: 'mub-correlation',
		bases: [0, 1],
		claimedSchmidtNumber: 2
	};
	const created = await call('/api/v1/claims', {
		method: 'POST',
		headers: { ...bearer(), 'content-type': 'application/json' },
		body: JSON.stringify(claim)
	});
	claimId = (await created.json()).id;
	const upload = await call(`/api/v1/claims/${claimId}/datasets`, {
		method: 'POST',
		headers: { ...bearer(), 'content-type': 'text/csv' },
		body: csv
	});
	expect(upload.status).toBe(201);
});
afterAll(async () => {
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
});

describe('security headers', () => {
	// Directive names from CSP Level 3 (W3C) and the Fetch standard's nosniff; common practice.
	it('sends a CSP without inline script, nosniff, DENY and a referrer policy on pages', async () => {
		const page = await call('/');
		const csp = page.headers.get('content-security-policy') ?? '';
		for (const directive of [
			"default-src 'self'",
			"frame-ancestors 'none'",
			"form-action 'self'",
			"base-uri 'self'",
			"object-src 'none'"
		])
			expect(csp).toContain(directive);
		const scriptSrc = csp.split(';').find((d) => d.trim().startsWith('script-src')) ?? '';
		expect(scriptSrc).toMatch(/'nonce-|'sha256-/);
		expect(scriptSrc).not.toContain('unsafe-inline');
		expect(csp).not.toMatch(/https?:/);
		expect(page.headers.get('x-content-type-options')).toBe('nosniff');
		expect(page.headers.get('x-frame-options')).toBe('DENY');
		expect(page.headers.get('referrer-policy')).toBe('strict-origin-when-cross-origin');
		expect(page.headers.get('cache-control') ?? '').not.toContain('no-store');
	});

	it('sends them on API answers, 404s and refusals made before any page', async () => {
		for (const [route, init] of [
			['/api/v1/signing-keys', {}],
			['/api/v1/claims', {}],
			['/no-such-page', {}],
			['/claims?q=%00', { headers: cookie() }],
			['/api/v1/claims', { method: 'POST', headers: cookie() }]
		] as [string, RequestInit][]) {
			const response = await call(route, init);
			expect(response.headers.get('x-content-type-options'), route).toBe('nosniff');
			expect(response.headers.get('referrer-policy'), route).toBeTruthy();
		}
	});

	it('sends them on the files adapter-node serves before any hook: scripts, styles, fonts, static/', async () => {
		const html = await (await call('/')).text();
		const script = html.match(/\/_app\/immutable\/[^"'\s]+\.js/)?.[0];
		const style = html.match(/\/_app\/immutable\/[^"'\s]+\.css/)?.[0];
		expect(script, 'a script of the built client named in the landing page').toBeTruthy();
		expect(style, 'a stylesheet named in the landing page').toBeTruthy();
		const css = await (await call(style!)).text();
		const fontUrl = css.match(/url\(([^)]+\.woff2)\)/)?.[1];
		expect(fontUrl, 'a font named in the stylesheet').toBeTruthy();
		const font = new URL(fontUrl!.replace(/["']/g, ''), app.origin + style).pathname;
		for (const route of [script!, style!, font, '/_app/version.json', '/favicon.svg']) {
			const response = await call(route);
			expect(response.status, route).toBe(200);
			expect(response.headers.get('x-content-type-options'), route).toBe('nosniff');
			expect(response.headers.get('x-frame-options'), route).toBe('DENY');
			expect(response.headers.get('referrer-policy'), route).toBe(
				'strict-origin-when-cross-origin'
			);
		}
		// adapter-node's own long cache on hashed files stays.
		const immutable = 'public,max-age=31536000,immutable';
		expect((await call(script!)).headers.get('cache-control')).toBe(immutable);
	});

	it('forbids caching for signed-in callers, token calls and secrets shown once', async () => {
		const privateAnswers: [string, RequestInit][] = [
			['/claims', { headers: cookie() }],
			['/settings/tokens', { headers: cookie() }],
			['/api/v1/claims', { headers: bearer() }],
			[
				'/api/v1/tokens',
				{
					// Tokens are made in a signed-in browser only; the new token is shown once.
					method: 'POST',
					headers: { ...cookie(), origin: app.origin, 'content-type': 'application/json' },
					body: '{"name":"shown once"}'
				}
			]
		];
		for (const [route, init] of privateAnswers) {
			const response = await call(route, init);
			expect(response.status, route).toBeLessThan(300);
			expect(response.headers.get('cache-control'), route).toBe('no-store');
		}
	});

	it('sends no Referer to other sites from review and one-use links, and lets nothing cache them', async () => {
		for (const route of ['/review/rvw_madeup', '/reset/madeup', '/api/v1/review/rvw_madeup']) {
			const response = await call(route);
			expect(response.headers.get('referrer-policy'), route).toBe('same-origin');
			expect(response.headers.get('cache-control'), route).toBe('no-store');
		}
	});
});

describe('cookies behind https', () => {
	it('marks the session cookie Secure when ORIGIN is https, and not on plain http', async () => {
		const stale = { cookie: 'rankseal_session=stale0000' };
		const plain = (await call('/claims', { headers: stale })).headers.get('set-cookie') ?? '';
		expect(plain).toMatch(/^rankseal_session=;/);
		expect(plain).not.toMatch(/;\s*Secure/i);
		// A fresh data folder of its own (startApp's default): only the cookie's flags matter here.
		const secureApp = await startApp({ RANKSEAL_DEMO: '0', ORIGIN: 'https://rankseal.test' });
		try {
			const response = await fetch(secureApp.origin + '/claims', { headers: stale });
			const set = response.headers.get('set-cookie') ?? '';
			expect(set).toMatch(/^rankseal_session=;/);
			expect(set).toMatch(/;\s*Secure/i);
			expect(set).toMatch(/HttpOnly/i);
		} finally {
			await secureApp.stop();
		}
	});
});

describe('unsafe requests sent with a cookie', () => {
	it('refuses a bodiless cross-site or origin-less POST that would start a check', async () => {
		const route = `/api/v1/claims/${claimId}/checks`;
		for (const origin of ['https://elsewhere.example', null]) {
			const headers: Record<string, string> = cookie();
			if (origin) headers.origin = origin;
			const response = await call(route, { method: 'POST', headers });
			expect(response.status, String(origin)).toBe(403);
			const { error } = await response.json();
			expect(error.code).toBe('forbidden');
			expect(error.message).toContain('Authorization: Bearer');
		}
		const deleted = await call(`/api/v1/claims/${claimId}`, {
			method: 'DELETE',
			headers: { ...cookie(), origin: 'https://elsewhere.example' }
		});
		expect(deleted.status).toBe(403);
		const claim = await (await call(`/api/v1/claims/${claimId}`, { headers: bearer() })).json();
		expect(claim.latestCheck).toBeNull();
	});
});

describe('JSON bodies', () => {
	const send = (route: string, body: string, type: string) =>
		call(route, { method: 'POST', headers: { ...bearer(), 'content-type': type }, body });

	it('answers 415 unless the body is declared as JSON', async () => {
		for (const type of ['text/plain', 'application/x-www-form-urlencoded']) {
			const response = await send(`/api/v1/claims/${claimId}/checks`, '{"seed":7}', type);
			expect(response.status, type).toBe(415);
			expect((await response.json()).error.code).toBe('unsupported_media_type');
		}
	});

	it('documents 413 and 415 on every operation that takes a JSON body', async () => {
		const doc = await (await call('/api/v1/openapi.json')).json();
		const withJson = Object.values(doc.paths as Record<string, Record<string, any>>)
			.flatMap((operations) => Object.values(operations))
			.filter((op) => Object.keys(op.requestBody?.content ?? {}).join() === 'application/json');
		expect(withJson.length).toBeGreaterThan(8);
		for (const op of withJson)
			expect(Object.keys(op.responses), op.operationId).toEqual(
				expect.arrayContaining(['413', '415'])
			);
	});

	it('refuses numbers sent as text, lists or loosely written, naming the field', async () => {
		const route = `/api/v1/claims/${claimId}/checks`;
		for (const [body, field] of [
			['{"resamples":"0x100"}', 'resamples'],
			['{"resamples":[1000]}', 'resamples'],
			['{"seed":1e400}', 'seed'],
			['{"seed":5.0}', 'seed']
		]) {
			const response = await send(route, body, 'application/json');
			expect(response.status, body).toBe(400);
			const { error } = await response.json();
			expect(error, body).toMatchObject({ code: 'bad_input', field });
		}
		const claim = await (await call(`/api/v1/claims/${claimId}`, { headers: bearer() })).json();
		expect(claim.latestCheck).toBeNull();
	});
});

describe('bodies over the limit', () => {
	const datasets = async () =>
		(await (await call(`/api/v1/claims/${claimId}/datasets`, { headers: bearer() })).json()).length;

	it('answers 413 too_large for a chunked upload, a chunked JSON body and a declared one', async () => {
		const before = await datasets();
		const attempts: [string, RequestInit][] = [
			[
				`/api/v1/claims/${claimId}/datasets`,
				{
					method: 'POST',
					headers: { ...bearer(), 'content-type': 'text/csv' },
					...chunked(3 * BODY_LIMIT)
				}
			],
			[
				'/api/v1/claims',
				{
					method: 'POST',
					headers: { ...bearer(), 'content-type': 'application/json' },
					...chunked(3 * BODY_LIMIT, 0x20)
				}
			],
			[
				`/api/v1/claims/${claimId}/datasets`,
				{
					method: 'POST',
					headers: { ...bearer(), 'content-type': 'text/csv' },
					body: new Uint8Array(3 * BODY_LIMIT).fill(0x30)
				}
			]
		];
		for (const [route, init] of attempts) {
			const response = await call(route, init);
			expect(response.status, route).toBe(413);
			expect((await response.json()).error.code).toBe('too_large');
		}
		expect(await datasets()).toBe(before);
		expect(partFiles()).toEqual([]);
	});

	it('shows a 413 page in words for a chunked form upload, and keeps nothing', async () => {
		const before = await datasets();
		const boundary = 'rankseal-413';
		const head = `--${boundary}\r\nContent-Disposition: form-data; name="counts"; filename="big.csv"\r\nContent-Type: text/csv\r\n\r\n`;
		const { body } = chunked(3 * BODY_LIMIT);
		const encode = (text: string) => new TextEncoder().encode(text);
		const framed = new ReadableStream<Uint8Array>({
			async start(controller) {
				controller.enqueue(encode(head));
				const reader = body.getReader();
				for (let r = await reader.read(); !r.done; r = await reader.read())
					controller.enqueue(r.value);
				controller.enqueue(encode(`\r\n--${boundary}--\r\n`));
				controller.close();
			}
		});
		const response = await call(`/claims/${claimId}?/upload`, {
			method: 'POST',
			headers: {
				...cookie(),
				origin: app.origin,
				accept: 'text/html',
				'content-type': `multipart/form-data; boundary=${boundary}`
			},
			body: framed,
			duplex: 'half'
		} as RequestInit);
		expect(response.status).toBe(413);
		const html = await response.text();
		expect(html).toContain('That is too large');
		expect(html).toContain('larger than this server accepts');
		expect(await datasets()).toBe(before);
		expect(partFiles()).toEqual([]);
	});
});
