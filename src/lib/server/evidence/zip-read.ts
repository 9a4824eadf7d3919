/**
 * Reads the files of a zip archive (stored or deflated entries, no zip64, no encryption) with
 * node:zlib; enough for evidence bundles. Folder prefixes are dropped: a bundle is one folder.
 */
import { inflateRawSync } from 'node:zlib';
import type { EvidenceFiles } from '../../evidence/layout';

export class ZipError extends Error {}

/** No bundle file comes near this; a larger entry is refused rather than inflated. */
const MAX_ENTRY_BYTES = 64 * 1024 * 1024;

function endOfCentralDirectory(zip: Buffer): number {
	for (let i = zip.length - 22; i >= Math.max(0, zip.length - 22 - 0xffff); i--)
		if (zip.readUInt32LE(i) === 0x06054b50) return i;
	throw new ZipError('not a zip archive (no end of central directory)');
}

function entryBytes(zip: Buffer, local: number, method: number, size: number): Buffer {
	if (zip.readUInt32LE(local) !== 0x04034b50) throw new ZipError('a local file header is damaged');
	const start = local + 30 + zip.readUInt16LE(local + 26) + zip.readUInt16LE(local + 28);
	const raw = zip.subarray(start, start + size);
	if (method === 0) return Buffer.from(raw);
	if (method === 8) {
		try {
			return inflateRawSync(raw, { maxOutputLength: MAX_ENTRY_BYTES });
		} catch (error) {
			throw new ZipError(`an entry cannot be inflated: ${(error as Error).message}`);
		}
	}
	throw new ZipError(`unsupported compression method ${method}`);
}

function readEntries(zip: Buffer): EvidenceFiles {
	const end = endOfCentralDirectory(zip);
	const count = zip.readUInt16LE(end + 10);
	let at = zip.readUInt32LE(end + 16);
	const files: EvidenceFiles = {};
	for (let i = 0; i < count; i++) {
		if (zip.readUInt32LE(at) !== 0x02014b50) throw new ZipError('the central directory is damaged');
		const method = zip.readUInt16LE(at + 10);
		const compressed = zip.readUInt32LE(at + 20);
		const nameLength = zip.readUInt16LE(at + 28);
		const skip = nameLength + zip.readUInt16LE(at + 30) + zip.readUInt16LE(at + 32);
		const name = zip.toString('utf8', at + 46, at + 46 + nameLength);
		const local = zip.readUInt32LE(at + 42);
		at += 46 + skip;
		if (name.endsWith('/')) continue;
		const base = name.slice(name.lastIndexOf('/') + 1);
		if (base in files) throw new ZipError(`the archive holds ${base} twice`);
		files[base] = entryBytes(zip, local, method, compressed);
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
