/** Reading a request body within a bound: raw bytes, or JSON validated by a zod schema. */
import type { ZodType } from 'zod';
import { isJsonType, JSON_BODY_LIMIT, jsonValue, notJson } from './json-body';
import { ApiError } from './problems';

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
