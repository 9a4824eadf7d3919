/**
 * Reads the files of a zip archive (stored or deflated entries, no zip64, no encryption) with
 * node:zlib; enough for evidence bundles. A bundle is one folder: its prefix is dropped, and any
 * other path (.., absolute, backslashes, deeper folders) is refused, as are archives that would
 * inflate past what any bundle holds. Nothing is ever written to disk.
 */
import { inflateRawSync } from 'node:zlib';
import type { EvidenceFiles } from '../../evidence/layout';

export class ZipError extends Error {}

/** No bundle file comes near this; a larger entry is refused rather than inflated. */
const MAX_ENTRY_BYTES = 64 * 1024 * 1024;
/** Nor does a whole bundle (a 20 MiB counts file twice over, the PDF and the verifier). */
export const MAX_INFLATED_BYTES = 128 * 1024 * 1024;
/** A bundle has a dozen files; a thousand entries is an attack on the reader, not a bundle. */
const MAX_ENTRIES = 64;

/** The file name inside the bundle's folder; ZipError for any name that leaves or nests it. */
function bundleName(name: string): string {
	const parts = name.split('/');
	const hostile =
		/[\\\0:]/.test(name) ||
		name.startsWith('/') ||
		parts.length > 2 ||
		parts.some((part) => part === '' || part === '.' || part === '..');
	if (hostile) throw new ZipError(`the entry name ${JSON.stringify(name)} is not a bundle file`);
	return parts[parts.length - 1];
}

function endOfCentralDirectory(zip: Buffer): number {
	for (let i = zip.length - 22; i >= Math.max(0, zip.length - 22 - 0xffff); i--)
		if (zip.readUInt32LE(i) === 0x06054b50) return i;
	throw new ZipError('not a zip archive (no end of central directory)');
}

interface Entry {
	local: number;
	method: number;
	compressed: number;
	/** The inflated size the central directory declares; the bytes must match it. */
	size: number;
}

function entryBytes(zip: Buffer, { local, method, compressed, size }: Entry): Buffer {
	if (zip.readUInt32LE(local) !== 0x04034b50) throw new ZipError('a local file header is damaged');
	const start = local + 30 + zip.readUInt16LE(local + 26) + zip.readUInt16LE(local + 28);
	const raw = zip.subarray(start, start + compressed);
	let bytes: Buffer;
	if (method === 0) bytes = Buffer.from(raw);
	else if (method === 8) {
		try {
			// One byte more than declared is enough to catch an entry that lies about its size.
			bytes = inflateRawSync(raw, { maxOutputLength: size + 1 });
		} catch (error) {
			throw new ZipError(`an entry cannot be inflated: ${(error as Error).message}`);
		}
	} else throw new ZipError(`unsupported compression method ${method}`);
	if (bytes.length !== size) throw new ZipError('an entry is not the size the archive declares');
	return bytes;
}

function readEntries(zip: Buffer): EvidenceFiles {
	const end = endOfCentralDirectory(zip);
	const count = zip.readUInt16LE(end + 10);
	if (count > MAX_ENTRIES) throw new ZipError(`${count} entries is far more than a bundle holds`);
	let at = zip.readUInt32LE(end + 16);
	const files: EvidenceFiles = {};
	let total = 0;
	for (let i = 0; i < count; i++) {
		if (zip.readUInt32LE(at) !== 0x02014b50) throw new ZipError('the central directory is damaged');
		const entry: Entry = {
			method: zip.readUInt16LE(at + 10),
			compressed: zip.readUInt32LE(at + 20),
			size: zip.readUInt32LE(at + 24),
			local: zip.readUInt32LE(at + 42)
		};
		const nameLength = zip.readUInt16LE(at + 28);
		const skip = nameLength + zip.readUInt16LE(at + 30) + zip.readUInt16LE(at + 32);
		const name = zip.toString('utf8', at + 46, at + 46 + nameLength);
		at += 46 + skip;
		if (/^[^/]+\/$/.test(name)) continue;
		const base = bundleName(name);
		if (base in files) throw new ZipError(`the archive holds ${base} twice`);
		total += entry.size;
		if (entry.size > MAX_ENTRY_BYTES || total > MAX_INFLATED_BYTES)
			throw new ZipError('the archive inflates to more than any bundle holds');
		files[base] = entryBytes(zip, entry);
	}
	return files;
}

export function readZip(zip: Buffer): EvidenceFiles {
	try {
		return readEntries(zip);
	} catch (error) {
		// Offsets pointing past the end surface as RangeError: the archive is damaged.
		if (error instanceof ZipError) throw error;
		throw new ZipError('not a readable zip archive');
	}
}
