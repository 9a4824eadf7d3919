/** The API helpers on their own: upload reading and limits, JSON bodies, 401, the form-origin check. */
import type { RequestEvent } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { MAX_COUNTS_FILE_BYTES } from '../../src/lib/certify';
import {
	ApiError,
	apiEndpoint,
	formOriginCheck,
	readCountsUpload,
	readJson
} from '../../src/lib/server/api';
import { ANONYMOUS } from '../../src/lib/server/access/actor';

const url = new URL('http://127.0.0.1:3000/api/v1/claims/c1/datasets');
const post = (body: BodyInit, headers: Record<string, string> = {}) =>
	new Request(url, { method: 'POST', body, headers, duplex: 'half' } as RequestInit);
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
		expect(await failure(readJson(post('{seed:'), schema))).toMatchObject({
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

describe('the form-origin check', () => {
	const run = async (headers: Record<string, string>, path = '/api/v1/claims/c1/datasets') => {
		const target = new URL(path, url);
		const event = {
			request: new Request(target, { method: 'POST', headers, body: 'x' }),
			url: target
		};
		const response = await formOriginCheck({
			event: event as unknown as RequestEvent,
			resolve: async () => new Response('passed')
		});
		return response.status;
	};
	const multipart = { 'content-type': 'multipart/form-data; boundary=x' };

	it('refuses cross-site and origin-less form posts, as Kit does', async () => {
		expect(await run(multipart)).toBe(403);
		expect(await run({ ...multipart, origin: 'http://elsewhere.example' })).toBe(403);
		expect(await run({ ...multipart, origin: url.origin })).toBe(200);
		expect(await run({ 'content-type': 'text/csv' })).toBe(200);
	});

	it('lets API calls with a bearer token through, and only those', async () => {
		expect(await run({ ...multipart, authorization: 'Bearer rks_x' })).toBe(200);
		expect(await run({ ...multipart, authorization: 'Bearer rks_x' }, '/settings/tokens')).toBe(
			403
		);
		expect(await run({ ...multipart, authorization: 'Basic eDp5' })).toBe(403);
	});
});
