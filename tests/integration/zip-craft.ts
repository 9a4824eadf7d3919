/**
 * Hand-made zip archives for the hostile-bundle tests: any entry name, duplicate names, and a
 * declared size that may lie, which no well-behaved zip writer produces. The layout follows
 * PKWARE's APPNOTE.TXT (4.3.7 local header, 4.3.12 central directory, 4.3.16 end record).
 */
import { deflateRawSync } from 'node:zlib';

export interface CraftedEntry {
	name: string;
	bytes: Uint8Array;
	/** Deflate (method 8) instead of storing. */
	deflate?: boolean;
	/** The uncompressed size written in the headers, when it should not be the true one. */
	declaredSize?: number;
	/** Already-deflated bytes to use as they are (a bomb made once, used many times). */
	raw?: Buffer;
}

export function craftZip(entries: CraftedEntry[]): Buffer {
	const locals: Buffer[] = [];
	const centrals: Buffer[] = [];
	let offset = 0;
	for (const entry of entries) {
		const name = Buffer.from(entry.name, 'utf8');
		const method = entry.deflate || entry.raw ? 8 : 0;
		const data =
			entry.raw ?? (method === 8 ? deflateRawSync(entry.bytes) : Buffer.from(entry.bytes));
		const size = entry.declaredSize ?? entry.bytes.length;
		const local = Buffer.alloc(30);
		local.writeUInt32LE(0x04034b50, 0);
		local.writeUInt16LE(20, 4);
		local.writeUInt16LE(method, 8);
		local.writeUInt32LE(data.length, 18);
		local.writeUInt32LE(size, 22);
		local.writeUInt16LE(name.length, 26);
		const central = Buffer.alloc(46);
		central.writeUInt32LE(0x02014b50, 0);
		central.writeUInt16LE(20, 4);
		central.writeUInt16LE(20, 6);
		central.writeUInt16LE(method, 10);
		central.writeUInt32LE(data.length, 20);
		central.writeUInt32LE(size, 24);
		central.writeUInt16LE(name.length, 28);
		central.writeUInt32LE(offset, 42);
		locals.push(local, name, data);
		centrals.push(central, name);
		offset += local.length + name.length + data.length;
	}
	const directory = Buffer.concat(centrals);
	const end = Buffer.alloc(22);
	end.writeUInt32LE(0x06054b50, 0);
	end.writeUInt16LE(entries.length, 8);
	end.writeUInt16LE(entries.length, 10);
	end.writeUInt32LE(directory.length, 12);
	end.writeUInt32LE(offset, 16);
	return Buffer.concat([...locals, directory, end]);
}
