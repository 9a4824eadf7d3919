/**
 * `--counts` given several times (issue 18): the files become one counts set, as one upload of
 * several files does in the service (certify/counts-set.ts), so the input SHA-256 is the same.
 * `--file-basis 0,1` gives, in order, the basis of each file holding one bare grid (blank: the
 * file names its bases).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { InputError } from '../lib/certify';
import { writeCountsSet } from '../lib/certify/counts-set';

function readOne(file: string): Uint8Array {
	try {
		return readFileSync(file);
	} catch (error) {
		throw new InputError(
			`cannot read --counts ${file}: ${(error as NodeJS.ErrnoException).code ?? 'error'}`
		);
	}
}

function fileBases(text: string | undefined, count: number): (number | null)[] {
	if (text === undefined) return new Array(count).fill(null);
	const fields = text.split(',').map((f) => f.trim());
	if (fields.length !== count)
		throw new InputError(
			`--file-basis gives ${fields.length} value(s) for ${count} --counts file(s): one each, blank for a file that names its bases`
		);
	return fields.map((f) => {
		if (f === '') return null;
		if (!/^\d+$/.test(f)) throw new InputError(`--file-basis must hold whole numbers, got '${f}'`);
		return Number(f);
	});
}

/** The bytes to read and hash, and how the report names them. */
export function readCountsFiles(
	files: string[],
	fileBasis: string | undefined
): { bytes: Uint8Array; label: string } {
	const bases = fileBases(fileBasis, files.length);
	if (files.length === 1 && bases[0] === null) return { bytes: readOne(files[0]), label: files[0] };
	const set = files.map((file, i) => ({
		name: path.basename(file),
		bytes: readOne(file),
		basis: bases[i]
	}));
	return { bytes: writeCountsSet(set), label: files.join(' + ') };
}
