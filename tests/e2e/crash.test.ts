/**
 * The crash test (issue 8): the built server is killed with SIGKILL at seeded points while many
 * certificates are being issued, then restarted on the same data folder. Wherever the kill
 * lands, the folder must be whole: SQLite's integrity_check says ok, `ledger:verify` passes,
 * every certificate row has its PDF and bundle with the recorded SHA-256, no file lacks a row,
 * no `.part` file remains, and every certificate answered with 201 survived. Where a kill lands
 * depends on the machine's speed; none of the assertions does.
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import http from 'node:http';
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync, watch } from 'node:fs';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../../src/lib/server/db';
import { seedApiWorld, type ApiWorld } from './api-world';
import { addFinishedClaims, type FinishedClaim } from './certificate-world';
import { startApp, type AppServer } from './server';

const ROUNDS = 4;
const IN_FLIGHT = 8;
const SEED = 20261202;

let world: ApiWorld;
let claims: FinishedClaim[];
let app: AppServer | null = null;
const acknowledged = new Set<string>();

/** mulberry32 (T. Ettinger, public domain; common practice): seeded uniforms in [0, 1). */
function uniforms(seed: number): () => number {
	let state = seed >>> 0;
	return () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/**
 * Sends an issue request on a connection of its own (a pooled one could outlive a killed server
 * whose port the next one reuses); the status, or 0 when the kill cut the connection.
 */
function issue(server: AppServer, claim: FinishedClaim): Promise<number> {
	const body = JSON.stringify({ checkId: claim.checkId });
	const url = `${server.origin}/api/v1/claims/${claim.claimId}/certificates`;
	const headers = {
		authorization: `Bearer ${world.tokens.lake}`,
		'content-type': 'application/json',
		'content-length': Buffer.byteLength(body)
	};
	return new Promise((done) => {
		const request = http.request(url, { method: 'POST', headers, agent: false }, (response) => {
			const chunks: Buffer[] = [];
			response.on('data', (chunk) => chunks.push(chunk));
			response.on('error', () => done(0));
			response.on('end', () => {
				if (!response.complete) return done(0);
				if (response.statusCode === 201)
					acknowledged.add(JSON.parse(Buffer.concat(chunks).toString()).id);
				done(response.statusCode ?? 0);
			});
		});
		request.on('error', () => done(0));
		request.end(body);
	});
}

/** Every file under the folder ([] before the first certificate made it). */
function filesUnder(folder: string): string[] {
	return existsSync(folder) ? readdirSync(folder, { recursive: true, encoding: 'utf8' }) : [];
}

/** Everything the issue promises about the data folder, checked with the server idle. */
async function assertWhole(dataDir: string) {
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	try {
		const check = await database.sequelize.query('PRAGMA integrity_check', {
			type: QueryTypes.SELECT
		});
		expect(check).toEqual([{ integrity_check: 'ok' }]);
		const rows = (await database.models.Certificate.findAll()).map((r) => r.get({ plain: true }));
		const owned = new Set<string>();
		for (const row of rows) {
			expect(sha256(readFileSync(path.join(dataDir, row.pdfPath))), row.id).toBe(row.pdfSha256);
			expect(sha256(readFileSync(path.join(dataDir, row.bundlePath))), row.id).toBe(
				row.bundleSha256
			);
			owned.add(row.pdfPath).add(row.bundlePath);
		}
		const stored = filesUnder(path.join(dataDir, 'certificates')).map((f) => `certificates/${f}`);
		expect(stored.sort()).toEqual([...owned].sort());
		expect(filesUnder(dataDir).filter((f) => /\.part$|\.tmp$/.test(f))).toEqual([]);
		const ids = new Set(rows.map((r) => r.id));
		expect([...acknowledged].filter((id) => !ids.has(id))).toEqual([]);
	} finally {
		await database.sequelize.close();
	}
	const ledger = spawnSync('npm', ['run', '--silent', 'ledger:verify'], {
		env: { ...process.env, RANKSEAL_DATA_DIR: dataDir },
		encoding: 'utf8'
	});
	expect(ledger.status, ledger.stdout + ledger.stderr).toBe(0);
	expect(ledger.stdout).toMatch(/^ledger intact/);
}

/**
 * Sends the issue requests and kills the server at the target-th change in the certificates
 * folder (files are written as .part, renamed, then the transaction commits), or once all
 * requests are answered when fewer changes come.
 */
async function killWhileIssuing(server: AppServer, target: number): Promise<number[]> {
	const answered = Promise.all(
		Array.from({ length: IN_FLIGHT }, (_, i) => issue(server, claims[i % claims.length]))
	);
	const watcher = watch(path.join(world.dataDir, 'certificates'));
	let seen = 0;
	await new Promise<void>((reached) => {
		watcher.on('change', () => ++seen >= target && reached());
		void answered.then(() => reached());
	});
	watcher.close();
	await server.kill();
	return answered;
}

const start = () => startApp({ RANKSEAL_DATA_DIR: world.dataDir, RANKSEAL_DEMO: '0' });

beforeAll(async () => {
	world = await seedApiWorld();
	claims = await addFinishedClaims(world.dataDir, 3);
});
afterAll(async () => {
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
});

describe('killed while issuing', () => {
	// A generous safety limit for a busy machine, not a measured duration.
	it(
		'leaves each certificate complete or absent, the ledger intact, no stray files',
		{ timeout: 600_000 },
		async () => {
			const next = uniforms(SEED);
			mkdirSync(path.join(world.dataDir, 'certificates'), { recursive: true });
			for (let round = 0; round < ROUNDS; round++) {
				app = await start();
				// Start-up has swept what the previous kill left; the folder must be whole now.
				if (round > 0) await assertWhole(world.dataDir);
				const statuses = await killWhileIssuing(app, 1 + Math.floor(next() * 24));
				// 0: cut by the kill; 409: another issue for the claim won the race; never a 500.
				expect(
					statuses.filter((s) => ![0, 201, 409].includes(s)),
					app.output()
				).toEqual([]);
			}
			app = await start();
			await assertWhole(world.dataDir);
			// After all that, issuing still works, one claim after another.
			for (const claim of claims) expect(await issue(app, claim), app.output()).toBe(201);
			await app.stop();
			app = null;
			await assertWhole(world.dataDir);
			expect(acknowledged.size).toBeGreaterThanOrEqual(claims.length);
		}
	);
});
