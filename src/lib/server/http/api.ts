/**
 * Helpers for the JSON API (routes/api/v1): the caller requirement (a session cookie or a bearer
 * token, both resolved into locals.actor) and bounded body reading: JSON bodies and counts uploads.
 * Errors answer through problems.ts, as everywhere.
 */
import type { RequestEvent, RequestHandler } from '@sveltejs/kit';
import type { ZodType } from 'zod';
import { MAX_COUNTS_FILE_BYTES } from '$lib/certify';
import type { Actor } from '../core/actor';
import { app } from '../app/app';
import type { Database } from '../db';
import { isJsonType, JSON_BODY_LIMIT, jsonValue, notJson } from './json-body';
import { ApiError, apiProblem, problemResponse } from './problems';

export { ApiError, describeIssues } from './problems';

interface Context {
	event: RequestEvent;
	actor: Actor;
	database: Database;
}

/** An endpoint for identified callers: 401 for anonymous ones, service errors as JSON. */
export function apiEndpoint(handler: (context: Context) => Promise<Response>): RequestHandler {
	return async (event) => {
		const actor = event.locals.actor;
		if (actor.kind === 'anonymous') {
			return problemResponse({
				status: 401,
				code: 'unauthorised',
				message: 'Sign in, or send an API token as "Authorization: Bearer rks_…".'
			});
		}
		try {
			return await handler({ event, actor, database: (await app()).database });
		} catch (error) {
			return apiProblem(error);
		}
	};
}

/** Kit's adapter errors the body stream with a 413 once BODY_SIZE_LIMIT is passed. */
const overLimit = (error: unknown) =>
	typeof error === 'object' && error !== null && (error as { status?: unknown }).status === 413;

/**
 * The request body, refusing more than `limit` bytes (413) whatever Content-Length says. An
 * over-size body is read to its end and dropped, not cut off: cancelling the stream would reset
 * the connection before the client sees the 413. Kit's BODY_SIZE_LIMIT bounds that reading.
 */
export async function readBody(request: Request, limit: number): Promise<Uint8Array<ArrayBuffer>> {
	const tooLarge = () =>
		new ApiError(413, 'too_large', `The body is larger than the limit of ${limit} bytes.`);
	let over = Number(request.headers.get('content-length') ?? 0) > limit;
	if (!request.body) {
		if (over) throw tooLarge();
		return new Uint8Array(0);
	}
	const chunks: Uint8Array<ArrayBuffer>[] = [];
	let size = 0;
	const reader = request.body.getReader();
	for (;;) {
		const { done, value } = await reader.read().catch((error: unknown) => {
			throw overLimit(error) ? tooLarge() : error;
		});
		if (done) break;
		size += value.byteLength;
		over ||= size > limit;
		if (!over) chunks.push(value);
	}
	if (over) throw tooLarge();
	return Buffer.concat(chunks);
}

/**
 * A JSON body validated by the schema: 415 unless it is declared as JSON, 400 naming the field
 * for a number written loosely or a value of the wrong kind. A blank body is `{}`, whatever its type.
 */
export async function readJson<T>(request: Request, schema: ZodType<T>): Promise<T> {
	const type = request.headers.get('content-type');
	const text = new TextDecoder().decode(await readBody(request, JSON_BODY_LIMIT)).trim();
	if (!text) return schema.parse({});
	if (!isJsonType(type)) throw notJson(type);
	return schema.parse(jsonValue(text));
}

const MULTIPART_OVERHEAD = 64 * 1024;

/**
 * A counts file sent as the multipart field `counts`, or as a raw text/csv or application/json
 * body (name from ?name= or "counts.csv"/"counts.json"). 413 above MAX_COUNTS_FILE_BYTES.
 */
export async function readCountsUpload(
	request: Request,
	url: URL
): Promise<{ bytes: Uint8Array; originalName: string; calibration?: Uint8Array }> {
	const type = (request.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	const tooLarge = new ApiError(
		413,
		'too_large',
		`The counts file is larger than the limit of ${MAX_COUNTS_FILE_BYTES} bytes.`
	);
	if (type === 'multipart/form-data') {
		const body = await readBody(request, MAX_COUNTS_FILE_BYTES + MULTIPART_OVERHEAD);
		const form = await new Response(body, {
			headers: { 'content-type': request.headers.get('content-type')! }
		})
			.formData()
			.catch(() => {
				throw new ApiError(400, 'bad_input', 'The multipart body cannot be read.');
			});
		const file = form.get('counts');
		if (!(file instanceof File))
			throw new ApiError(
				400,
				'bad_input',
				'Send the counts file in the multipart field "counts".',
				'counts'
			);
		if (file.size > MAX_COUNTS_FILE_BYTES) throw tooLarge;
		// An optional calibration file beside the counts (witnesses.md §4.4).
		const calibration = form.get('calibration');
		return {
			bytes: new Uint8Array(await file.arrayBuffer()),
			originalName: file.name || 'counts',
			...(calibration instanceof File && calibration.size > 0
				? { calibration: new Uint8Array(await calibration.arrayBuffer()) }
				: {})
		};
	}
	if (type === 'text/csv' || type === 'application/json') {
		const bytes = await readBody(request, MAX_COUNTS_FILE_BYTES).catch((error) => {
			throw error instanceof ApiError && error.status === 413 ? tooLarge : error;
		});
		const fallback = type === 'text/csv' ? 'counts.csv' : 'counts.json';
		return { bytes, originalName: url.searchParams.get('name')?.trim() || fallback };
	}
	// Read what was sent first: answering before the body is in resets the connection mid-upload.
	await readBody(request, MAX_COUNTS_FILE_BYTES).catch(() => undefined);
	throw new ApiError(
		415,
		'unsupported_media_type',
		'Send the counts as multipart/form-data (field "counts"), text/csv or application/json.'
	);
}
