/**
 * The fault tests' shared parts (crash, shutdown, backup): seeded uniforms, requests on their own
 * connections, waiting for a state of the data folder, and `assertWhole`, everything issue 10
 * promises about a data folder after a kill, a stop or a restore. Nothing here waits for a time.
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, watch } from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import sqlite3 from 'sqlite3';
import { expect } from 'vitest';
import { openDatabase, type Database } from '../../src/lib/server/db';

/** mulberry32 (T. Ettinger, public domain; common practice): seeded uniforms in [0, 1). */
export function uniforms(seed: number): () => number {
	let state = seed >>> 0;
	return () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

export const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

export interface Answer {
	/** 0 when the connection was cut (a kill) before the whole answer came. */
	status: number;
	body: string;
}

/**
 * One request on a connection of its own (a pooled one could outlive a killed server whose port
 * the next one reuses).
 */
export function send(
	url: string,
	method: string,
	headers: Record<string, string | number>,
	body?: Uint8Array | string
): Promise<Answer> {
	return new Promise((done) => {
		const request = http.request(url, { method, headers, agent: false }, (response) => {
			const chunks: Buffer[] = [];
			response.on('data', (chunk) => chunks.push(chunk));
			response.on('error', () => done({ status: 0, body: '' }));
			response.on('end', () =>
				done({
					status: response.complete ? (response.statusCode ?? 0) : 0,
					body: Buffer.concat(chunks).toString()
				})
			);
		});
		request.on('error', () => done({ status: 0, body: '' }));
		request.end(body);
	});
}

/** Every file under the folder, relative to it ([] when it does not exist). */
export function filesUnder(folder: string): string[] {
	if (!existsSync(folder)) return [];
	return readdirSync(folder, { recursive: true, withFileTypes: true })
		.filter((entry) => entry.isFile())
		.map((entry) => path.relative(folder, path.join(entry.parentPath, entry.name)));
}

/**
 * Resolves once `reached()` is true, asking again whenever something under the folder changes
 * (the SQLite WAL grows with every commit), or when the signal aborts. No deadline: the test's
 * timeout is the bound.
 */
export function whenChanged(
	folder: string,
	reached: () => Promise<boolean>,
	signal?: AbortSignal
): Promise<void> {
	return new Promise((done, fail) => {
		const watcher = watch(folder, { recursive: false });
		signal?.addEventListener('abort', () => {
			watcher.close();
			done();
		});
		let asking = false;
		let again = false;
		const ask = async () => {
			if (asking) return void (again = true);
			asking = true;
			try {
				do {
					again = false;
					if (signal?.aborted) return;
					if (await reached()) {
						watcher.close();
						return done();
					}
				} while (again);
			} catch (error) {
				watcher.close();
				fail(error);
			} finally {
				asking = false;
			}
		};
		watcher.on('change', () => void ask());
		void ask();
	});
}

export const databaseFile = (dataDir: string) => path.join(dataDir, 'rankseal.sqlite');

/** Opens the folder's database for the callback (with the server stopped or idle), then closes it. */
export async function withDatabase<T>(
	dataDir: string,
	read: (database: Database) => Promise<T>
): Promise<T> {
	const database = await openDatabase(databaseFile(dataDir));
	try {
		return await read(database);
	} finally {
		await database.sequelize.close();
	}
}

/** Every dataset row's bytes are stored under their hash and every stored file has its row. */
async function assertUploads(dataDir: string, database: Database) {
	const rows = await database.models.Dataset.findAll({ attributes: ['sha256'] });
	const owned = new Set(rows.map((r) => r.get('sha256') as string));
	for (const hash of owned) {
		const file = path.join(dataDir, 'files', hash.slice(0, 2), hash);
		expect(existsSync(file), `dataset file ${hash}`).toBe(true);
		expect(sha256(readFileSync(file)), file).toBe(hash);
	}
	const stored = filesUnder(path.join(dataDir, 'files')).map((f) => path.basename(f));
	expect(stored.sort()).toEqual([...owned].sort());
}

/** Every certificate row's PDF and bundle have the recorded SHA-256; no file lacks a row. */
async function assertCertificates(dataDir: string, database: Database, acknowledged: Set<string>) {
	const rows = (await database.models.Certificate.findAll()).map((r) => r.get({ plain: true }));
	const owned = new Set<string>();
	for (const row of rows) {
		expect(sha256(readFileSync(path.join(dataDir, row.pdfPath))), row.id).toBe(row.pdfSha256);
		expect(sha256(readFileSync(path.join(dataDir, row.bundlePath))), row.id).toBe(row.bundleSha256);
		owned.add(row.pdfPath).add(row.bundlePath);
	}
	const stored = filesUnder(path.join(dataDir, 'certificates')).map((f) => `certificates/${f}`);
	expect(stored.sort()).toEqual([...owned].sort());
	const ids = new Set(rows.map((r) => r.id));
	expect([...acknowledged].filter((id) => !ids.has(id))).toEqual([]);
}

/**
 * Everything the issue promises about the data folder, checked with the server idle:
 * integrity_check ok, uploads and certificates each whole with their rows, no temporary file,
 * every acknowledged certificate present, and `ledger:verify` passes.
 */
export async function assertWhole(dataDir: string, acknowledged = new Set<string>()) {
	await withDatabase(dataDir, async (database) => {
		const check = await database.sequelize.query('PRAGMA integrity_check', {
			type: QueryTypes.SELECT
		});
		expect(check).toEqual([{ integrity_check: 'ok' }]);
		await assertUploads(dataDir, database);
		await assertCertificates(dataDir, database, acknowledged);
	});
	expect(filesUnder(dataDir).filter((f) => /\.part$|\.tmp$/.test(f))).toEqual([]);
	const ledger = spawnSync('npm', ['run', '--silent', 'ledger:verify'], {
		env: { ...process.env, RANKSEAL_DATA_DIR: dataDir },
		encoding: 'utf8'
	});
	expect(ledger.status, ledger.stdout + ledger.stderr).toBe(0);
	expect(ledger.stdout).toMatch(/^ledger intact/);
}

/**
 * Rows from the folder's database on a read-only connection of its own, safe while the server
 * writes (WAL readers see the last commit).
 */
export function readRows<T = Record<string, unknown>>(dataDir: string, sql: string): Promise<T[]> {
	return new Promise((done, fail) => {
		const connection = new sqlite3.Database(databaseFile(dataDir), sqlite3.OPEN_READONLY, (e) => {
			if (e) return fail(e);
			connection.configure('busyTimeout', 10_000);
			connection.all(sql, (error, rows) =>
				connection.close(() => (error ? fail(error) : done(rows as T[])))
			);
		});
	});
}

/** A POST to the API with a bearer token, on a connection of its own. */
export function apiPost(
	origin: string,
	token: string,
	route: string,
	body: string,
	type = 'application/json'
): Promise<Answer> {
	const headers = {
		authorization: `Bearer ${token}`,
		'content-type': type,
		'content-length': Buffer.byteLength(body)
	};
	return send(`${origin}/api/v1${route}`, 'POST', headers, body);
}
