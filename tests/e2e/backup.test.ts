/**
 * Backup and restore while the server runs (issue 10, faults): the built server keeps uploading,
 * checking and issuing certificates while `npm run backup` copies its data folder; the copy is
 * restored with `npm run restore` into a new folder and the server starts there. The restored
 * folder must be whole (fault-world.ts `assertWhole`: integrity_check ok, `ledger:verify`
 * passes, every certificate and upload row's file present with its SHA-256, nothing unowned) and
 * hold every certificate issued before the backup began. A changed file in the backup, and a
 * data folder that is not empty, are refused by name.
 */
import { spawn, spawnSync } from 'node:child_process';
import { appendFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { seedApiWorld, type ApiWorld } from './api-world';
import { addFinishedClaims, type FinishedClaim } from './certificate-world';
import { apiPost, assertWhole, readRows, whenChanged } from './fault-world';
import { startApp, type AppServer } from './server';

let world: ApiWorld;
let claims: FinishedClaim[];
let app: AppServer | null = null;
const folders: string[] = [];
const temporary = (prefix: string) => {
	const folder = mkdtempSync(path.join(tmpdir(), prefix));
	folders.push(folder);
	return folder;
};

beforeAll(async () => {
	world = await seedApiWorld();
	claims = await addFinishedClaims(world.dataDir, 3);
});
afterAll(async () => {
	await app?.stop();
	for (const folder of [world?.dataDir, ...folders])
		if (folder) rmSync(folder, { recursive: true, force: true });
});

/** Runs an npm script to its end (without blocking the test's event loop); exit code and output. */
function npmRun(
	args: string[],
	env: Record<string, string>
): Promise<{ code: number | null; output: string }> {
	return new Promise((done) => {
		const child = spawn('npm', ['run', '--silent', ...args], { env: { ...process.env, ...env } });
		let output = '';
		child.stdout.on('data', (chunk) => (output += chunk));
		child.stderr.on('data', (chunk) => (output += chunk));
		child.once('exit', (code) => done({ code, output }));
	});
}

/** Uploads, checks and certificates, one after another in three loops, until `stop()`. */
function keepWriting(server: AppServer) {
	const token = world.tokens.lake;
	let running = true;
	let n = 0;
	const statuses: number[] = [];
	const loop = async (step: (i: number) => Promise<number>) => {
		for (let i = 0; running; i++) statuses.push(await step(i));
	};
	const upload = async () => {
		n += 1;
		const csv = toCountsCsv(
			sampledCounts(states.isotropic(5, 0.9), [0, 1, 2], 20_000, 500 + n),
			[]
		);
		return (
			await apiPost(server.origin, token, `/claims/${claims[0].claimId}/datasets`, csv, 'text/csv')
		).status;
	};
	const check = async (i: number) =>
		(
			await apiPost(
				server.origin,
				token,
				`/claims/${claims[i % 3].claimId}/checks`,
				JSON.stringify({ resamples: 2000, seed: i + 1 })
			)
		).status;
	const issue = async (i: number) => {
		const claim = claims[i % 3];
		const body = JSON.stringify({ checkId: claim.checkId });
		return (await apiPost(server.origin, token, `/claims/${claim.claimId}/certificates`, body))
			.status;
	};
	const loops = Promise.all([loop(upload), loop(check), loop(issue)]);
	return {
		statuses,
		stop: async () => {
			running = false;
			await loops;
		}
	};
}

describe('backup while the server writes, restore into a new folder', () => {
	it('restores a whole folder whose ledger verifies', { timeout: 600_000 }, async () => {
		app = await start();
		const writing = keepWriting(app);
		// Once the first certificate exists, the backup starts while the writing goes on.
		await whenChanged(
			world.dataDir,
			async () => (await readRows(world.dataDir, 'SELECT id FROM certificates')).length > 0
		);
		const before = await readRows<{ id: string }>(world.dataDir, 'SELECT id FROM certificates');
		const backupDir = path.join(temporary('rankseal-backup-'), 'copy');
		const backup = await npmRun(['backup', '--', '--out', backupDir], {
			RANKSEAL_DATA_DIR: world.dataDir
		});
		expect(backup.code, backup.output).toBe(0);
		await writing.stop();
		// 201/202 done, 409 another issue won the race; never a 5xx.
		expect(writing.statuses.filter((s) => ![201, 202, 409].includes(s))).toEqual([]);
		await app.stop();
		app = null;

		const restored = temporary('rankseal-restored-');
		const restore = await npmRun(['restore', '--', backupDir], { RANKSEAL_DATA_DIR: restored });
		expect(restore.code, restore.output).toBe(0);
		app = await startApp({ RANKSEAL_DATA_DIR: restored, RANKSEAL_DEMO: '0' });
		await app.stop();
		app = null;
		await assertWhole(restored, new Set(before.map((r) => r.id)));

		// The restore refuses a folder in use, and a backup with a changed file, naming it.
		const busy = await npmRun(['restore', '--', backupDir], { RANKSEAL_DATA_DIR: restored });
		expect(busy.code).toBe(1);
		expect(busy.output).toMatch(/is not empty/);
		const key = spawnSync('ls', [path.join(backupDir, 'keys')], { encoding: 'utf8' }).stdout.split(
			'\n'
		)[0];
		appendFileSync(path.join(backupDir, 'keys', key), ' ');
		const changed = await npmRun(['restore', '--', backupDir], {
			RANKSEAL_DATA_DIR: temporary('rankseal-empty-')
		});
		expect(changed.code).toBe(1);
		expect(changed.output).toContain(`keys/${key} does not have the SHA-256`);
	});
});

const start = () => startApp({ RANKSEAL_DATA_DIR: world.dataDir, RANKSEAL_DEMO: '0' });
