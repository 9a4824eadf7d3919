/**
 * rankseal backup — a consistent copy of a data folder, safe while the server runs.
 *   npm run --silent backup -- --out DIR
 * First the database, with SQLite's online backup API in one step (one read snapshot; writers
 * go on), then exactly the files that snapshot names (uploads and certificate files, each checked
 * against its recorded SHA-256) and the signing keys, then backup-manifest.json. Files written
 * after the snapshot are left out; rows written after it are not in it. Exit 0 done, 1 not.
 */
import { chmod, copyFile, mkdir, readdir, rename, writeFile } from 'node:fs/promises';
import path from 'node:path';
import sqlite3 from 'sqlite3';
import { config } from '../lib/server/core/config';
import {
	DATABASE_NAME,
	MANIFEST_FORMAT,
	MANIFEST_NAME,
	fileSha256,
	type BackupEntry,
	type BackupManifest
} from './backup-manifest';

/** node-sqlite3's Database#backup, which its type definitions leave out. */
interface SqliteBackup {
	step(pages: number, done: (error: Error | null) => void): void;
	finish(done?: (error: Error | null) => void): void;
	completed: boolean;
}
type BackupCapable = sqlite3.Database & {
	backup(file: string, done: (error: Error | null) => void): SqliteBackup;
};

const promised = <T>(run: (done: (error: Error | null, value?: T) => void) => void) =>
	new Promise<T>((resolve, reject) =>
		run((error, value) => (error ? reject(error) : resolve(value as T)))
	);

/** Copies the live database into `target` in one backup step: every page from one snapshot. */
async function snapshotDatabase(source: string, target: string): Promise<void> {
	const live = new sqlite3.Database(source, sqlite3.OPEN_READWRITE) as BackupCapable;
	try {
		live.configure('busyTimeout', 10_000);
		const backup = await promised<SqliteBackup>((done) => {
			const made = live.backup(target, (error) => done(error, made));
		});
		await promised<void>((done) => backup.step(-1, done));
		if (!backup.completed) throw new Error('the database backup did not complete');
		await promised<void>((done) => backup.finish(done));
	} finally {
		await promised<void>((done) => live.close(done));
	}
}

interface NamedFile {
	relative: string;
	/** The SHA-256 the snapshot records for it. */
	sha256: string;
}

/** The upload and certificate files the snapshot's rows name, with their recorded hashes. */
async function filesNamedBy(snapshot: string): Promise<NamedFile[]> {
	const copy = new sqlite3.Database(snapshot, sqlite3.OPEN_READWRITE);
	const all = (sql: string) =>
		promised<Record<string, string>[]>((done) =>
			copy.all(sql, (error, rows) => done(error, rows as Record<string, string>[]))
		);
	try {
		// A single file, without -wal and -shm beside it; the server turns WAL on again when it opens it.
		await all('PRAGMA journal_mode = DELETE');
		const datasets = await all('SELECT DISTINCT sha256 FROM datasets');
		const certificates = await all(
			'SELECT pdf_path, pdf_sha256, bundle_path, bundle_sha256 FROM certificates'
		);
		return [
			...datasets.map((r) => ({
				relative: `files/${r.sha256.slice(0, 2)}/${r.sha256}`,
				sha256: r.sha256
			})),
			...certificates.flatMap((r) => [
				{ relative: r.pdf_path, sha256: r.pdf_sha256 },
				{ relative: r.bundle_path, sha256: r.bundle_sha256 }
			])
		];
	} finally {
		await promised<void>((done) => copy.close(done));
	}
}

/** Copies one file and checks the copy against the hash its row records. */
async function copyChecked(dataDir: string, out: string, file: NamedFile): Promise<BackupEntry> {
	const target = path.join(out, file.relative);
	await mkdir(path.dirname(target), { recursive: true });
	await copyFile(path.join(dataDir, file.relative), target).catch((error) => {
		throw new Error(
			`${file.relative}, named by the database, could not be copied: ${error.message}`
		);
	});
	const { sha256, bytes } = await fileSha256(target);
	if (sha256 !== file.sha256)
		throw new Error(`${file.relative} does not have the SHA-256 its row records`);
	return { path: file.relative, sha256, bytes };
}

/** The signing keys (keys/<id>.json and keys/current), owner-only as in the data folder. */
async function copyKeys(dataDir: string, out: string): Promise<BackupEntry[]> {
	const names = (await readdir(path.join(dataDir, 'keys'))).filter(
		(name) => name === 'current' || /^[0-9a-f]{64}\.json$/.test(name)
	);
	await mkdir(path.join(out, 'keys'), { mode: 0o700 });
	const entries: BackupEntry[] = [];
	for (const name of names.sort()) {
		const target = path.join(out, 'keys', name);
		await copyFile(path.join(dataDir, 'keys', name), target);
		await chmod(target, 0o600);
		entries.push({ path: `keys/${name}`, ...(await fileSha256(target)) });
	}
	return entries;
}

async function backup(out: string): Promise<BackupManifest> {
	const { dataDir, databasePath } = config();
	await mkdir(out, { recursive: true, mode: 0o700 });
	if ((await readdir(out)).length) throw new Error(`${out} is not empty`);
	await snapshotDatabase(databasePath, path.join(out, DATABASE_NAME));
	const named = await filesNamedBy(path.join(out, DATABASE_NAME));
	const files: BackupEntry[] = [
		{ path: DATABASE_NAME, ...(await fileSha256(path.join(out, DATABASE_NAME))) }
	];
	for (const file of named)
		if (!files.some((f) => f.path === file.relative))
			files.push(await copyChecked(dataDir, out, file));
	files.push(...(await copyKeys(dataDir, out)));
	const manifest: BackupManifest = {
		format: MANIFEST_FORMAT,
		createdAt: new Date().toISOString(),
		files: [files[0], ...files.slice(1).sort((a, b) => a.path.localeCompare(b.path))]
	};
	const written = path.join(out, `${MANIFEST_NAME}.part`);
	await writeFile(written, JSON.stringify(manifest, null, '\t') + '\n');
	await rename(written, path.join(out, MANIFEST_NAME));
	return manifest;
}

function outFolder(args: string[]): string {
	const at = args.indexOf('--out');
	if (at < 0 || !args[at + 1]) throw new Error('name the backup folder: --out DIR');
	return path.resolve(args[at + 1]);
}

Promise.resolve()
	.then(() => backup(outFolder(process.argv.slice(2))))
	.then(
		(manifest) =>
			console.log(`backup done: ${manifest.files.length} files (see ${MANIFEST_NAME}).`),
		(error) => {
			console.error(`backup failed: ${(error as Error).message}`);
			process.exitCode = 1;
		}
	);
