/**
 * The start-up sweep of uploaded counts files (files/<sha[0:2]>/<sha>): a process killed while
 * storing one leaves a `.part` file, or a renamed file whose transaction never committed; a
 * restored backup may bring files that no row of its snapshot names. None of them has a row.
 */
import { readdir, rm, stat } from 'node:fs/promises';
import path from 'node:path';
import { config } from '../core/config';
import type { Database } from '../db';

export interface UploadSweep {
	/** Paths under the data folder that were removed: temporary files and files without a row. */
	removed: string[];
	/** Paths under the data folder that a dataset row names but that are not there. */
	missing: string[];
}

const SHA256_NAME = /^[0-9a-f]{64}$/;

/** Every file under files/, as paths relative to it ([] before the first upload). */
async function storedFiles(folder: string): Promise<string[]> {
	const entries = await readdir(folder, { recursive: true, withFileTypes: true }).catch(
		() => [] as import('node:fs').Dirent[]
	);
	return entries
		.filter((entry) => entry.isFile())
		.map((entry) => path.relative(folder, path.join(entry.parentPath, entry.name)));
}

/**
 * Removes every file under files/ that is not the stored bytes of some dataset row, and names the
 * rows whose bytes are missing (a fault outside the app: the sweep cannot bring them back).
 * Run it before the server takes requests: an upload in flight would look like an orphan.
 */
export async function sweepUploadFiles(database: Database): Promise<UploadSweep> {
	const folder = config().filesDir;
	const rows = await database.models.Dataset.findAll({ attributes: ['sha256'] });
	const owned = new Set(rows.map((row) => row.get('sha256') as string));
	const removed: string[] = [];
	for (const relative of await storedFiles(folder)) {
		const name = path.basename(relative);
		const wanted = relative === path.join(name.slice(0, 2), name);
		if (SHA256_NAME.test(name) && wanted && owned.has(name)) continue;
		await rm(path.join(folder, relative), { force: true });
		removed.push(path.join('files', relative));
	}
	const missing: string[] = [];
	for (const sha256 of owned) {
		const relative = path.join(sha256.slice(0, 2), sha256);
		const present = await stat(path.join(folder, relative)).then(
			(found) => found.isFile(),
			() => false
		);
		if (!present) missing.push(path.join('files', relative));
	}
	return { removed, missing };
}
