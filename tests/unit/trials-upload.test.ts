/** Uploads of time-ordered trials, plain or gzip (RFC 1952, node:zlib), with a cap on the inflated size. */
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { isotropicTrialsCsv, parseTrials } from '../../src/lib/certify/trials';
import { parseTrialsUpload } from '../../src/lib/server/checks/trials-upload';

const bytes = (text: string) => new TextEncoder().encode(text);

/** The bytes as an upload arrives: chunks of `size`. */
async function* chunked(data: Uint8Array, size = 4096) {
	for (let i = 0; i < data.length; i += size) yield data.subarray(i, i + size);
}

describe('trials upload', () => {
	const csv = bytes(isotropicTrialsCsv(5, 0.8, [0, 1], 5000, 12));
	const expected = parseTrials(csv, 5, 'trials');

	it('reads a plain file in chunks to the same data as in one piece', async () => {
		expect(await parseTrialsUpload(chunked(csv, 777), 5, 'trials')).toEqual(expected);
	});

	it('reads the same file gzip-compressed', async () => {
		expect(await parseTrialsUpload(chunked(gzipSync(csv), 100), 5, 'trials')).toEqual(expected);
	});

	it('stops a gzip bomb at the cap on the inflated size', async () => {
		const big = bytes('basis,outcome_a,outcome_b\n' + '0,1,1\n'.repeat(2_000_000));
		const bomb = gzipSync(big);
		expect(bomb.length).toBeLessThan(100_000);
		await expect(parseTrialsUpload(chunked(bomb), 5, 'trials', 1_000_000)).rejects.toThrow(
			/inflates to more than 1000000 bytes/
		);
	});

	it('refuses a cut gzip stream and an empty upload clearly', async () => {
		const cut = gzipSync(csv).subarray(0, 200);
		await expect(parseTrialsUpload(chunked(cut), 5, 'trials')).rejects.toThrow(
			/not a readable gzip file/
		);
		await expect(parseTrialsUpload(chunked(new Uint8Array(0)), 5, 'trials')).rejects.toThrow(
			/the file is empty/
		);
	});

	it('names the line of a bad row inside a gzip file', async () => {
		const bad = gzipSync(bytes('basis,outcome_a,outcome_b\n0,1,1\n0,9,1\n'));
		await expect(parseTrialsUpload(chunked(bad), 5, 'trials')).rejects.toThrow(
			/line 3, column 2: outcome_a must be 0..4, got 9/
		);
	});
});
