/** The API helpers on their own: upload reading and limits, JSON bodies, 401, the origin check. */
import { isHttpError, type RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { MAX_COUNTS_FILE_BYTES } from '../../src/lib/certify';
import { checkRequestJsonSchema, claimJsonSchema } from '../../src/lib/claims/schema';
import { ApiError, apiEndpoint } from '../../src/lib/server/http/api';
import { readCountsUpload } from '../../src/lib/server/http/multipart';
import { readJson } from '../../src/lib/server/http/read-body';
import { originCheck } from '../../src/lib/server/http/request-guards';
import { ANONYMOUS } from '../../src/lib/server/core/actor';

const url = new URL('http://127.0.0.1:3000/api/v1/claims/c1/datasets');
const post = (body: BodyInit, headers: Record<string, string> = {}) =>
	new Request(url, { method: 'POST', body, headers, duplex: 'half' } as RequestInit);
/** The field a refusal names: ApiError's own, or the first path of a zod error. */
const problemField = (error: unknown) =>
	error instanceof ApiError
		? error.field
		: (error as { issues?: { path: PropertyKey[] }[] })?.issues?.[0]?.path[0];
const failure = (promise: Promise<unknown>) =>
	promise.then(
		() => null,
		(error: ApiError) => error
	);

describe('reading a counts upload', () => {
	it('takes the multipart field "counts" with its file name', async () => {
		const form = new FormData();
		form.set('counts', new Blob(['basis,outcome_a,outcome_b,counts\n']), 'run.csv');
		const upload = await readCountsUpload(post(form), url);
		expect(upload.originalName).toBe('run.csv');
		expect(new TextDecoder().decode(upload.bytes)).toBe('basis,outcome_a,outcome_b,counts\n');
	});

	it('takes a raw text/csv or application/json body, named by ?name=', async () => {
		const csv = await readCountsUpload(
			post('a,b', { 'content-type': 'text/csv; charset=utf-8' }),
			new URL(url + '?name=x.csv')
		);
		expect(csv.originalName).toBe('x.csv');
		expect(
			(await readCountsUpload(post('{}', { 'content-type': 'application/json' }), url)).originalName
		).toBe('counts.json');
	});

	it('answers 400 without the field, 415 for other types and 413 above the limit', async () => {
		const form = new FormData();
		form.set('other', 'x');
		// No file at all is a missing field, not a bad counts file.
		expect(await failure(readCountsUpload(post(form), url))).toMatchObject({
			status: 400,
			code: 'bad_input',
			field: 'counts'
		});
		expect(
			await failure(readCountsUpload(post('<a/>', { 'content-type': 'application/xml' }), url))
		).toMatchObject({ status: 415 });
		const big = new Uint8Array(MAX_COUNTS_FILE_BYTES + 1);
		expect(
			await failure(readCountsUpload(post(big, { 'content-type': 'text/csv' }), url))
		).toMatchObject({ status: 413, code: 'too_large' });
		// Without a Content-Length the stream is counted as it arrives.
		const stream = new Blob([big]).stream();
		expect(
			await failure(readCountsUpload(post(stream, { 'content-type': 'text/csv' }), url))
		).toMatchObject({ status: 413 });
	});
});

describe('JSON bodies and sign-in', () => {
	const schema = z.object({ seed: z.number().optional() });

	it('reads a blank body as {} and refuses text that is not JSON', async () => {
		expect(await readJson(post(''), schema)).toEqual({});
		expect(
			await failure(readJson(post('{seed:', { 'content-type': 'application/json' }), schema))
		).toMatchObject({
			status: 400,
			code: 'bad_input'
		});
	});

	it('answers 401 in the error shape when nobody is signed in', async () => {
		const handler = apiEndpoint(async () => new Response('never'));
		const response = await handler({
			locals: { actor: ANONYMOUS, user: null, session: null }
		} as unknown as RequestEvent);
		expect(response.status).toBe(401);
		expect(await response.json()).toEqual({
			error: { code: 'unauthorised', message: expect.stringContaining('Bearer') }
		});
	});
});

describe('the origin check', () => {
	const run = async (
		headers: Record<string, string>,
		path = '/api/v1/claims/c1/datasets',
		method = 'POST'
	) => {
		const target = new URL(path, url);
		const body = method === 'POST' && !headers.bodiless ? 'x' : undefined;
		const event = { request: new Request(target, { method, headers, body }), url: target };
		try {
			const response = await originCheck({
				event: event as unknown as RequestEvent,
				resolve: async () => new Response('passed')
			});
			return response.status;
		} catch (error) {
			if (isHttpError(error)) return error.status;
			throw error;
		}
	};
	const multipart = { 'content-type': 'multipart/form-data; boundary=x' };
	const cookie = { cookie: 'rankseal_session=abc' };

	it('refuses cross-site and origin-less form posts, as Kit does', async () => {
		expect(await run(multipart)).toBe(403);
		expect(await run({ ...multipart, origin: 'http://elsewhere.example' })).toBe(403);
		expect(await run({ ...multipart, origin: url.origin })).toBe(200);
		// No cookie, no form type: a script without credentials (the API answers it 401).
		expect(await run({ 'content-type': 'text/csv' })).toBe(200);
	});

	// OWASP CSRF Prevention Cheat Sheet ("Verifying Origin with standard headers"), common practice.
	it('refuses any unsafe method sent with a cookie from elsewhere or without Origin', async () => {
		const bodiless = { ...cookie, bodiless: '1' };
		expect(await run(bodiless, '/api/v1/claims/c1/checks')).toBe(403);
		expect(await run({ ...cookie, 'content-type': 'application/json' }, '/api/v1/claims')).toBe(
			403
		);
		const foreign = { ...cookie, origin: 'http://elsewhere.example' };
		expect(await run({ ...foreign, 'content-type': 'application/json' })).toBe(403);
		for (const method of ['PUT', 'PATCH', 'DELETE'])
			expect(await run(cookie, '/api/v1/claims/c1', method), method).toBe(403);
		expect(await run({ ...bodiless, origin: url.origin }, '/api/v1/claims/c1/checks')).toBe(200);
		// Reading is safe: a link from elsewhere still opens the page.
		expect(await run(foreign, '/claims', 'GET')).toBe(200);
	});

	it('lets API calls with a bearer token through, and only those', async () => {
		expect(await run({ ...multipart, authorization: 'Bearer rks_x' })).toBe(200);
		expect(await run({ ...cookie, authorization: 'Bearer rks_x' })).toBe(200);
		expect(await run({ ...multipart, authorization: 'Bearer rks_x' }, '/settings/tokens')).toBe(
			403
		);
		expect(await run({ ...multipart, authorization: 'Basic eDp5' })).toBe(403);
	});

	it('says why, in the error shape of the API', async () => {
		const target = new URL('/api/v1/claims', url);
		const request = new Request(target, { method: 'POST', headers: cookie });
		const response = await originCheck({
			event: { request, url: target } as unknown as RequestEvent,
			resolve: async () => new Response('passed')
		});
		const { error } = await response.json();
		expect(error.code).toBe('forbidden');
		expect(error.message).toContain('without an Origin header');
	});
});

describe('JSON bodies take JSON', () => {
	const json = (body: string, type: string | null = 'application/json') =>
		post(body, type === null ? {} : { 'content-type': type });

	it('needs Content-Type: application/json (a charset may follow): 415 otherwise', async () => {
		const schema = z.object({ seed: z.number() });
		for (const type of ['text/plain', 'application/x-www-form-urlencoded', 'text/json'])
			expect(await failure(readJson(json('{"seed":1}', type), schema)), type).toMatchObject({
				status: 415,
				code: 'unsupported_media_type'
			});
		for (const type of ['application/json', 'application/json; charset=utf-8', 'Application/JSON'])
			expect(await readJson(json('{"seed":1}', type), schema), type).toEqual({ seed: 1 });
		const bare = new Request(url, { method: 'POST', body: new Uint8Array([123, 125]) });
		expect(await failure(readJson(bare, schema))).toMatchObject({ status: 415 });
	});

	// RFC 8259 §6 has one number type; we take a whole number only as written without . or e,
	// the rule the counts files follow (README, counts formats).
	it('refuses numbers as text, lists, booleans, out-of-range and loosely written integers', async () => {
		const cases: [string, string][] = [
			['{"resamples":"0x100"}', 'resamples'],
			['{"resamples":"1000"}', 'resamples'],
			['{"seed":true}', 'seed'],
			['{"seed":1e400}', 'seed'],
			['{"seed":5.0}', 'seed'],
			['{"seed":1e2}', 'seed'],
			['{"seed":-0}', 'seed'],
			['{"confidence":"0.99"}', 'confidence'],
			['{"subtractAccidentals":"true"}', 'subtractAccidentals']
		];
		for (const [body, field] of cases) {
			const problem = await failure(readJson(json(body), checkRequestJsonSchema));
			expect(problem, body).not.toBeNull();
			expect(problemField(problem), body).toBe(field);
		}
		expect(
			await readJson(json('{"resamples":1000,"confidence":0.95}'), checkRequestJsonSchema)
		).toMatchObject({ resamples: 1000, confidence: 0.95 });
	});

	it('refuses "dimension": [5], "5" and 5.0 in a claim, naming the field', async () => {
		const claim = {
			title: 't',
			sourceDescription: 's',
			method: 'mub-correlation',
			claimedSchmidtNumber: 2
		};
		for (const dimension of ['[5]', '"5"', '5.0', 'true', '{"d":5}']) {
			const body = JSON.stringify(claim).replace('{', `{"dimension":${dimension},`);
			const problem = await failure(readJson(json(body), claimJsonSchema));
			expect(problemField(problem), dimension).toBe('dimension');
		}
		const text = await failure(
			readJson(json(JSON.stringify({ ...claim, dimension: '5' })), claimJsonSchema)
		);
		expect((text as unknown as z.ZodError).issues[0].message).toBe(
			'The dimension must be a JSON number, not text ("5").'
		);
		const bases = JSON.stringify({ ...claim, dimension: 5, bases: '0,1' });
		expect(problemField(await failure(readJson(json(bases), claimJsonSchema)))).toBe('bases');
		const nested = JSON.stringify({ ...claim, dimension: 5 }).replace('{', '{"bases":[0, 1.0],');
		const loose = await failure(readJson(json(nested), claimJsonSchema));
		expect((loose as Error).message).toContain('bases.1');
		expect(
			await readJson(json(JSON.stringify({ ...claim, dimension: 5 })), claimJsonSchema)
		).toMatchObject({ dimension: 5, bases: [0, 1] });
	});
});
