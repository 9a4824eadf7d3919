/**
 * A time-ordered trials file as the parser reads it: gzip-compressed files (told by their first
 * two bytes) are inflated whole with node's zlib, up to a cap, so a verifier re-reads exactly
 * what the upload path streamed. Node only: kept out of the trials index, which pages import.
 */
import { gunzipSync } from 'node:zlib';
import { InputError } from '../counts';

/** 10⁸ rows of `b,aa,bb` need about 1 GB of text; nothing larger is inflated. */
export const MAX_TRIALS_INFLATED_BYTES = 1024 * 1024 * 1024;

export const isGzip = (bytes: Uint8Array): boolean =>
	bytes.length >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b;

/** The plain CSV bytes of a trials file: the file itself, or its gzip content inflated. */
export function plainTrialsBytes(
	bytes: Uint8Array,
	maxInflatedBytes = MAX_TRIALS_INFLATED_BYTES
): Uint8Array {
	if (!isGzip(bytes)) return bytes;
	try {
		return gunzipSync(bytes, { maxOutputLength: maxInflatedBytes });
	} catch (error) {
		if ((error as { code?: string }).code === 'ERR_BUFFER_TOO_LARGE')
			throw new InputError(
				`the file inflates to more than ${maxInflatedBytes} bytes; the limit is ${maxInflatedBytes} bytes`
			);
		throw new InputError(`not a readable gzip file (${(error as Error).message})`);
	}
}
