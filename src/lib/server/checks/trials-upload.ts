/**
 * Reads an uploaded time-ordered trials file, plain or gzip-compressed (told by its first two
 * bytes), chunk by chunk into the trials parser: memory stays one code per trial, and a gzip
 * stream is cut off as soon as its inflated size passes the cap (no decompression bombs).
 */
import { Readable } from 'node:stream';
import { createGunzip } from 'node:zlib';
import { InputError } from '../../certify/counts';
import { TrialsParser, type TrialsData, type TrialsMode } from '../../certify/trials';

/** 10⁸ rows of `b,aa,bb` need about 1 GB of text; nothing larger is inflated. */
export const MAX_TRIALS_INFLATED_BYTES = 1024 * 1024 * 1024;
const GZIP_MAGIC = [0x1f, 0x8b];

async function* prefixed(first: Uint8Array, rest: AsyncIterator<Uint8Array>) {
	yield first;
	for (let next = await rest.next(); !next.done; next = await rest.next()) yield next.value;
}

/** The chunks as read: gunzipped when the upload starts with the gzip magic bytes. */
async function plainChunks(source: AsyncIterable<Uint8Array>) {
	const iterator = source[Symbol.asyncIterator]();
	const first = await iterator.next();
	if (first.done) throw new InputError('the file is empty');
	const gzip = first.value[0] === GZIP_MAGIC[0] && first.value[1] === GZIP_MAGIC[1];
	const stream = Readable.from(prefixed(first.value, iterator), { objectMode: false });
	return { gzip, chunks: gzip ? stream.pipe(createGunzip()) : stream };
}

export async function parseTrialsUpload(
	source: AsyncIterable<Uint8Array>,
	dimension: number,
	mode: TrialsMode,
	maxInflatedBytes = MAX_TRIALS_INFLATED_BYTES
): Promise<TrialsData> {
	const parser = new TrialsParser(dimension, mode);
	const { gzip, chunks } = await plainChunks(source);
	let size = 0;
	try {
		for await (const chunk of chunks as AsyncIterable<Uint8Array>) {
			size += chunk.length;
			if (size > maxInflatedBytes)
				throw new InputError(
					`the file ${gzip ? 'inflates to' : 'is'} more than ${maxInflatedBytes} bytes; the limit is ${maxInflatedBytes} bytes`
				);
			parser.push(chunk);
		}
	} catch (error) {
		chunks.destroy();
		if (error instanceof InputError) throw error;
		throw new InputError(`not a readable gzip file (${(error as Error).message})`);
	}
	return parser.finish();
}
