/**
 * The counts store: uploaded counts files kept content-addressed under the files folder
 * (files/<sha[0:2]>/<sha>), written under a temporary name and renamed into place.
 * The start-up sweep of this folder is counts-sweep.ts.
 */
import { randomBytes } from 'node:crypto';
import { mkdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { config } from '../core/config';

/** Where the bytes with this SHA-256 live. */
export function datasetFilePath(sha256: string): string {
	return path.join(config().filesDir, sha256.slice(0, 2), sha256);
}

/** Writes the bytes under their hash unless they are there already; true when this call wrote them. */
export async function storeCounts(sha256: string, bytes: Uint8Array): Promise<boolean> {
	const file = datasetFilePath(sha256);
	if (
		await stat(file).then(
			() => true,
			() => false
		)
	)
		return false;
	await mkdir(path.dirname(file), { recursive: true });
	const temporary = `${file}.${randomBytes(6).toString('hex')}.part`;
	try {
		await writeFile(temporary, bytes);
		await rename(temporary, file);
	} catch (error) {
		await rm(temporary, { force: true });
		throw error;
	}
	return true;
}

/** Removes the stored bytes (callers first make sure no row names them). */
export async function removeCounts(sha256: string): Promise<void> {
	await rm(datasetFilePath(sha256), { force: true });
}
