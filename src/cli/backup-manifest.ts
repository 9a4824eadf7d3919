/**
 * The folder a backup makes and a restore reads: the database snapshot, the files it names and
 * the signing keys, at the same relative paths as under the data folder, plus
 * `backup-manifest.json` (written last: a folder without it is an unfinished backup).
 */
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { readdir } from 'node:fs/promises';
import path from 'node:path';

export const MANIFEST_NAME = 'backup-manifest.json';
export const DATABASE_NAME = 'rankseal.sqlite';
export const MANIFEST_FORMAT = 'rankseal-backup/1';

export interface BackupEntry {
	/** Relative to the backup folder, with forward slashes. */
	path: string;
	sha256: string;
	bytes: number;
}

export interface BackupManifest {
	format: typeof MANIFEST_FORMAT;
	createdAt: string;
	/** The database snapshot first, then every other file in path order. */
	files: BackupEntry[];
}

/** SHA-256 of a file, streamed (uploads and bundles can be large). */
export async function fileSha256(file: string): Promise<{ sha256: string; bytes: number }> {
	const hash = createHash('sha256');
	let bytes = 0;
	for await (const chunk of createReadStream(file)) {
		hash.update(chunk as Buffer);
		bytes += (chunk as Buffer).byteLength;
	}
	return { sha256: hash.digest('hex'), bytes };
}

/** Every regular file under the folder, relative to it, with forward slashes. */
export async function filesIn(folder: string): Promise<string[]> {
	const entries = await readdir(folder, { recursive: true, withFileTypes: true });
	return entries
		.filter((entry) => entry.isFile())
		.map((entry) => path.relative(folder, path.join(entry.parentPath, entry.name)))
		.map((relative) => relative.split(path.sep).join('/'))
		.sort();
}

/** A manifest path that stays inside the folder (a hand-edited manifest must not escape it). */
export function insideFolder(folder: string, relative: string): string {
	const target = path.resolve(folder, relative);
	if (path.isAbsolute(relative) || !target.startsWith(path.resolve(folder) + path.sep))
		throw new Error(`${MANIFEST_NAME}: the path ${JSON.stringify(relative)} leaves the folder`);
	return target;
}
