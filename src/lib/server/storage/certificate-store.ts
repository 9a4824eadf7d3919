/**
 * Where a certificate's PDF and bundle live (certificates/<id>.pdf|.zip under the data folder),
 * written under a temporary name and renamed into place inside the issuing transaction; files
 * left by an interrupted issue (no row) are swept at start-up.
 */
import { randomBytes } from 'node:crypto';
import { mkdir, readdir, rename, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { config } from '../core/config';
import type { Database } from '../db';

export const CERTIFICATE_FOLDER = 'certificates';

export const certificatePaths = (id: string) => ({
	pdfPath: `${CERTIFICATE_FOLDER}/${id}.pdf`,
	bundlePath: `${CERTIFICATE_FOLDER}/${id}.zip`
});

export const absolute = (relative: string) => path.join(config().dataDir, relative);

/** Writes each file under a temporary name, then renames them all; returns the paths written. */
export async function placeFiles(
	files: [relative: string, bytes: Uint8Array][]
): Promise<string[]> {
	await mkdir(absolute(CERTIFICATE_FOLDER), { recursive: true });
	const suffix = `.${randomBytes(6).toString('hex')}.part`;
	const placed: string[] = [];
	try {
		for (const [relative, bytes] of files) {
			placed.push(absolute(relative) + suffix);
			await writeFile(absolute(relative) + suffix, bytes, { flag: 'wx' });
		}
		for (const [relative] of files) {
			placed.push(absolute(relative));
			await rename(absolute(relative) + suffix, absolute(relative));
		}
	} catch (error) {
		await removeFiles(placed);
		throw error;
	}
	return placed;
}

export async function removeFiles(files: string[]): Promise<void> {
	await Promise.all(files.map((file) => rm(file, { force: true })));
}

/** Removes certificate files that no row owns (an issue killed between rename and commit). */
export async function sweepOrphanFiles(database: Database): Promise<string[]> {
	const folder = absolute(CERTIFICATE_FOLDER);
	const names = await readdir(folder).catch(() => [] as string[]);
	const rows = await database.models.Certificate.findAll({ attributes: ['pdfPath', 'bundlePath'] });
	const owned = new Set(rows.flatMap((r) => [r.get('pdfPath'), r.get('bundlePath')]));
	const orphans = names.filter((name) => !owned.has(`${CERTIFICATE_FOLDER}/${name}`));
	await removeFiles(orphans.map((name) => path.join(folder, name)));
	return orphans;
}
