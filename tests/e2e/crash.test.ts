/**
 * The crash test (issues 8 and 10): the built server is killed with SIGKILL at seeded points while
 * many certificates are issued, and while many counts files are uploaded at once (multipart and
 * raw bodies), then restarted on the same data folder. Wherever the kill lands, the folder must
 * be whole (fault-world.ts `assertWhole`: integrity_check ok, `ledger:verify` passes, every row's
 * file present with its SHA-256, no file without a row, no `.part` file) and every request
 * answered 201 survived. Where a kill lands depends on the machine's speed; no assertion does.
 */
import { mkdirSync, rmSync, watch } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { seedApiWorld, type ApiWorld } from './api-world';
import { addFinishedClaims, type FinishedClaim } from './certificate-world';
import { assertWhole, send, uniforms, withDatabase } from './fault-world';
import { startApp, type AppServer } from './server';

const ROUNDS = 4;
const IN_FLIGHT = 8;
const SEED = 20261202;

let world: ApiWorld;
let claims: FinishedClaim[];
let app: AppServer | null = null;
const acknowledged = new Set<string>();
const uploaded = new Set<string>();

const bearer = () => ({ authorization: `Bearer ${world.tokens.lake}` });

async function issue(server: AppServer, claim: FinishedClaim): Promise<number> {
	const body = JSON.stringify({ checkId: claim.checkId });
	const url = `${server.origin}/api/v1/claims/${claim.claimId}/certificates`;
	const headers = { ...bearer(), 'content-type': 'application/json' };
	const answer = await send(url, 'POST', { ...headers, 'content-length': body.length }, body);
	if (answer.status === 201) acknowledged.add(JSON.parse(answer.body).id);
	return answer.status;
}

/**
 * Kills the server at the target-th change in the watched folder, or once every request is
 * answered when fewer changes come; the answers' statuses (0 where the kill cut one).
 */
async function killDuring(
	server: AppServer,
	folder: string,
	target: number,
	requests: Promise<number>[]
): Promise<number[]> {
	const answered = Promise.all(requests);
	const watcher = watch(folder, { recursive: true });
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
			const folder = path.join(world.dataDir, 'certificates');
			mkdirSync(folder, { recursive: true });
			for (let round = 0; round < ROUNDS; round++) {
				app = await start();
				// Start-up has swept what the previous kill left; the folder must be whole now.
				if (round > 0) await assertWhole(world.dataDir, acknowledged);
				const requests = Array.from({ length: IN_FLIGHT }, (_, i) =>
					issue(app!, claims[i % claims.length])
				);
				// Files are written as .part, renamed, then the transaction commits.
				const statuses = await killDuring(app, folder, 1 + Math.floor(next() * 24), requests);
				// 0: cut by the kill; 409: another issue for the claim won the race; never a 500.
				expect(statuses.filter((s) => ![0, 201, 409].includes(s))).toEqual([]);
			}
			app = await start();
			await assertWhole(world.dataDir, acknowledged);
			// After all that, issuing still works, one claim after another.
			for (const claim of claims) expect(await issue(app, claim), app.output()).toBe(201);
			await app.stop();
			app = null;
			await assertWhole(world.dataDir, acknowledged);
			expect(acknowledged.size).toBeGreaterThanOrEqual(claims.length);
		}
	);
});

/** A counts file of its own for every upload (d = 5, three bases): no two share bytes. */
let files = 0;
function nextCountsFile(): string {
	files += 1;
	const tables = sampledCounts(states.isotropic(5, 0.9), [0, 1, 2], 20_000, 1000 + files);
	return toCountsCsv(tables, [`upload ${files}`]);
}

/** Uploads one file, as multipart (even uploads) or as a raw text/csv body (odd ones). */
async function upload(server: AppServer, claimId: string, multipart: boolean): Promise<number> {
	const csv = nextCountsFile();
	const url = `${server.origin}/api/v1/claims/${claimId}/datasets`;
	const boundary = `rankseal-crash-${files}`;
	const body = multipart
		? `--${boundary}\r\nContent-Disposition: form-data; name="counts"; filename="up${files}.csv"\r\n` +
			`Content-Type: text/csv\r\n\r\n${csv}\r\n--${boundary}--\r\n`
		: csv;
	const type = multipart ? `multipart/form-data; boundary=${boundary}` : 'text/csv';
	const headers = { ...bearer(), 'content-type': type, 'content-length': Buffer.byteLength(body) };
	const answer = await send(url, 'POST', headers, body);
	if (answer.status === 201) uploaded.add(JSON.parse(answer.body).id);
	return answer.status;
}

async function draftClaim(server: AppServer, title: string): Promise<string> {
	const fields = { title, sourceDescription: 'simulated', dimension: 5, method: 'mub-correlation' };
	const body = JSON.stringify({ ...fields, claimedSchmidtNumber: 3 });
	const headers = { ...bearer(), 'content-type': 'application/json' };
	const url = `${server.origin}/api/v1/claims`;
	const answer = await send(url, 'POST', { ...headers, 'content-length': body.length }, body);
	expect(answer.status, answer.body).toBe(201);
	return JSON.parse(answer.body).id;
}

describe('killed while uploading', () => {
	it(
		'leaves each upload stored with its row or not at all, and no temporary file',
		{ timeout: 600_000 },
		async () => {
			const next = uniforms(SEED + 1);
			app = await start();
			const targets = [await draftClaim(app, 'Uploads A'), await draftClaim(app, 'Uploads B')];
			for (let round = 0; round < ROUNDS; round++) {
				if (round > 0) {
					app = await start();
					await assertWhole(world.dataDir, acknowledged);
				}
				const requests = Array.from({ length: 2 * IN_FLIGHT }, (_, i) =>
					upload(app!, targets[i % 2], i % 4 < 2)
				);
				// Each upload writes files/<xx>/<sha>.<random>.part, renames it, then commits.
				const statuses = await killDuring(
					app,
					path.join(world.dataDir, 'files'),
					1 + Math.floor(next() * 30),
					requests
				);
				expect(statuses.filter((s) => ![0, 201].includes(s))).toEqual([]);
			}
			app = await start();
			await assertWhole(world.dataDir, acknowledged);
			expect(await upload(app, targets[0], true), app.output()).toBe(201);
			await app.stop();
			app = null;
			await assertWhole(world.dataDir, acknowledged);
			// Every upload answered 201 is there.
			const rows = await withDatabase(world.dataDir, (database) =>
				database.models.Dataset.findAll({ attributes: ['id'] })
			);
			const ids = new Set(rows.map((r) => r.get('id') as string));
			expect([...uploaded].filter((id) => !ids.has(id))).toEqual([]);
			expect(uploaded.size).toBeGreaterThan(0);
		}
	);
});
