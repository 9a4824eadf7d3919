/**
 * rankseal restore — brings a backup folder back into an empty data folder.
 *   RANKSEAL_DATA_DIR=/new/data npm run --silent restore -- DIR
 * Checks every file of backup-manifest.json against its SHA-256 first and refuses a folder with
 * a missing, changed or unlisted file; copies the files, then the database last (a data folder
 * without its database is an unfinished restore). Refuses a data folder that is not empty, except
 * for the old folder's published-checkpoint.json, copied in first so that the first start can say
 * whether the backup's ledger reaches what the service had published.
 * Exit 0 done, 1 not.
 */
import { chmod, copyFile, mkdir, readdir, readFile, rename } from 'node:fs/promises';
import path from 'node:path';
import { config } from '../lib/server/core/config';
import { CHECKPOINT_MEMORY } from '../lib/server/ledger/checkpoint-memory';
import {
	DATABASE_NAME,
	MANIFEST_FORMAT,
	MANIFEST_NAME,
	fileSha256,
	filesIn,
	insideFolder,
	type BackupManifest
} from './backup-manifest';

async function readManifest(folder: string): Promise<BackupManifest> {
	const text = await readFile(path.join(folder, MANIFEST_NAME), 'utf8').catch(() => {
		throw new Error(`${folder} has no ${MANIFEST_NAME}: not a backup, or an unfinished one`);
	});
	const manifest = JSON.parse(text) as BackupManifest;
	if (manifest.format !== MANIFEST_FORMAT || !Array.isArray(manifest.files))
		throw new Error(`${MANIFEST_NAME} is not a ${MANIFEST_FORMAT} manifest`);
	if (manifest.files[0]?.path !== DATABASE_NAME)
		throw new Error(`${MANIFEST_NAME} does not list ${DATABASE_NAME} first`);
	return manifest;
}

/** Every listed file is there with its hash, and nothing else is. */
async function checkFolder(folder: string, manifest: BackupManifest): Promise<void> {
	const listed = new Set(manifest.files.map((f) => f.path));
	const extra = (await filesIn(folder)).filter((f) => f !== MANIFEST_NAME && !listed.has(f));
	if (extra.length) throw new Error(`${extra[0]} is in the backup but not in ${MANIFEST_NAME}`);
	for (const entry of manifest.files) {
		const found = await fileSha256(insideFolder(folder, entry.path)).catch(() => null);
		if (!found) throw new Error(`${entry.path} is listed in ${MANIFEST_NAME} but missing`);
		if (found.sha256 !== entry.sha256)
			throw new Error(`${entry.path} does not have the SHA-256 ${MANIFEST_NAME} lists`);
	}
}

/** Empty, absent, or holding only the last published checkpoint copied from the old folder. */
async function emptyOrAbsent(folder: string): Promise<boolean> {
	return readdir(folder).then(
		(names) => names.every((name) => name === CHECKPOINT_MEMORY),
		() => true
	);
}

async function restore(folder: string): Promise<number> {
	const { dataDir, databasePath } = config();
	const manifest = await readManifest(folder);
	await checkFolder(folder, manifest);
	if (!(await emptyOrAbsent(dataDir))) throw new Error(`the data folder ${dataDir} is not empty`);
	await mkdir(dataDir, { recursive: true, mode: 0o700 });
	for (const entry of manifest.files.slice(1)) {
		const target = insideFolder(dataDir, entry.path);
		const keys = entry.path.startsWith('keys/');
		await mkdir(path.dirname(target), { recursive: true, mode: keys ? 0o700 : 0o755 });
		await copyFile(insideFolder(folder, entry.path), target);
		if (keys) await chmod(target, 0o600);
	}
	await mkdir(path.dirname(databasePath), { recursive: true });
	const partial = `${databasePath}.restore.part`;
	await copyFile(path.join(folder, DATABASE_NAME), partial);
	await rename(partial, databasePath);
	return manifest.files.length;
}

const folder = process.argv[2];
Promise.resolve()
	.then(() => {
		if (!folder) throw new Error('name the backup folder: npm run restore -- DIR');
		return restore(path.resolve(folder));
	})
	.then(
		(count) => console.log(`restore done: ${count} files into ${config().dataDir}.`),
		(error) => {
			console.error(`restore failed: ${(error as Error).message}`);
			process.exitCode = 1;
		}
	);
