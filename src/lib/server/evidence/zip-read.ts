/**
 * Reads the files of a zip archive (stored or deflated entries, no zip64, no encryption) with
 * node:zlib; enough for evidence bundles. A bundle is one folder: its prefix is dropped, and any
 * other path (.., absolute, backslashes, deeper folders) is refused, as are archives that would
 * inflate past what any bundle holds. Nothing is ever written to disk. The server inflates as a
 * stream on a worker thread (readZipStreamed); the command line reads in one go (readZip).
 */
import { createInflateRaw, inflateRawSync } from 'node:zlib';
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

/** One file of the archive: its bundle name, how it is stored and its still-compressed bytes. */
interface Entry {
	name: string;
	method: number;
	raw: Buffer;
	/** The inflated size the central directory declares; the bytes must match it. */
	size: number;
}

function entryRaw(zip: Buffer, local: number, compressed: number): Buffer {
	if (zip.readUInt32LE(local) !== 0x04034b50) throw new ZipError('a local file header is damaged');
	const start = local + 30 + zip.readUInt16LE(local + 26) + zip.readUInt16LE(local + 28);
	return zip.subarray(start, start + compressed);
}

/** Each file entry in turn, its name and declared size checked before the caller inflates it. */
function* listEntries(zip: Buffer): Generator<Entry> {
	const end = endOfCentralDirectory(zip);
	const count = zip.readUInt16LE(end + 10);
	if (count > MAX_ENTRIES) throw new ZipError(`${count} entries is far more than a bundle holds`);
	let at = zip.readUInt32LE(end + 16);
	const seen = new Set<string>();
	let total = 0;
	for (let i = 0; i < count; i++) {
		if (zip.readUInt32LE(at) !== 0x02014b50) throw new ZipError('the central directory is damaged');
		const method = zip.readUInt16LE(at + 10);
		const compressed = zip.readUInt32LE(at + 20);
		const size = zip.readUInt32LE(at + 24);
		const local = zip.readUInt32LE(at + 42);
		const nameLength = zip.readUInt16LE(at + 28);
		const skip = nameLength + zip.readUInt16LE(at + 30) + zip.readUInt16LE(at + 32);
		const fullName = zip.toString('utf8', at + 46, at + 46 + nameLength);
		at += 46 + skip;
		if (/^[^/]+\/$/.test(fullName)) continue;
		const name = bundleName(fullName);
		if (seen.has(name)) throw new ZipError(`the archive holds ${name} twice`);
		seen.add(name);
		total += size;
		if (size > MAX_ENTRY_BYTES || total > MAX_INFLATED_BYTES)
			throw new ZipError('the archive inflates to more than any bundle holds');
		if (method !== 0 && method !== 8)
			throw new ZipError(`unsupported compression method ${method}`);
		yield { name, method, size, raw: entryRaw(zip, local, compressed) };
	}
}

function sizeChecked(bytes: Buffer, size: number): Buffer {
	if (bytes.length !== size) throw new ZipError('an entry is not the size the archive declares');
	return bytes;
}

function inflatedAtOnce({ method, raw, size }: Entry): Buffer {
	if (method === 0) return sizeChecked(Buffer.from(raw), size);
	try {
		// One byte more than declared is enough to catch an entry that lies about its size.
		return sizeChecked(inflateRawSync(raw, { maxOutputLength: size + 1 }), size);
	} catch (error) {
		if (error instanceof ZipError) throw error;
		throw new ZipError(`an entry cannot be inflated: ${(error as Error).message}`);
	}
}

/** Inflates chunk by chunk and stops at the first byte past the declared size (a bomb ends there). */
function inflatedAsStream({ method, raw, size }: Entry): Promise<Buffer> {
	if (method === 0) return Promise.resolve(sizeChecked(Buffer.from(raw), size));
	return new Promise((done, fail) => {
		const inflater = createInflateRaw();
		const chunks: Buffer[] = [];
		let total = 0;
		inflater.on('data', (chunk: Buffer) => {
			total += chunk.length;
			if (total > size)
				inflater.destroy(new ZipError('an entry is not the size the archive declares'));
			else chunks.push(chunk);
		});
		inflater.on('error', (error) =>
			fail(
				error instanceof ZipError
					? error
					: new ZipError(`an entry cannot be inflated: ${error.message}`)
			)
		);
		inflater.on('end', () => {
			try {
				done(sizeChecked(Buffer.concat(chunks, total), size));
			} catch (error) {
				fail(error);
			}
		});
		inflater.end(raw);
	});
}

/** Offsets pointing past the end surface as RangeError: the archive is damaged. */
function asZipError(error: unknown): never {
	if (error instanceof ZipError) throw error;
	throw new ZipError('not a readable zip archive');
}

/** All at once, for the command line and tests (a local file, not a stranger's upload). */
export function readZip(zip: Buffer): EvidenceFiles {
	try {
		const files: EvidenceFiles = {};
		for (const entry of listEntries(zip)) files[entry.name] = inflatedAtOnce(entry);
		return files;
	} catch (error) {
		return asZipError(error);
	}
}

/** Entry by entry as streams, each capped at its declared size: what the server runs on a worker. */
export async function readZipStreamed(zip: Buffer): Promise<EvidenceFiles> {
	try {
		const files: EvidenceFiles = {};
		for (const entry of listEntries(zip)) files[entry.name] = await inflatedAsStream(entry);
		return files;
	} catch (error) {
		return asZipError(error);
	}
}
