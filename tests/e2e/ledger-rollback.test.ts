/**
 * Issue 15 part 5, the restore case: a backup taken before a claim was withdrawn is restored into
 * a new folder (with the old folder's published-checkpoint.json copied in first, as README
 * "A ledger cut short" says). The built server started there says in its log that the ledger no
 * longer reaches the checkpoint it published, naming the first missing entry, and
 * `ledger:verify` fails the same way; the withdrawal's notice mail held a checkpoint that shows it.
 */
import { spawn } from 'node:child_process';
import { copyFileSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedApiWorld, type ApiWorld } from './api-world';
import { addFinishedClaims, type FinishedClaim } from './certificate-world';
import { apiPost, readRows } from './fault-world';
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
	claims = await addFinishedClaims(world.dataDir, 1);
});
afterAll(async () => {
	await app?.stop();
	for (const folder of [world?.dataDir, ...folders])
		if (folder) rmSync(folder, { recursive: true, force: true });
});

/** Runs an npm script to its end (without blocking the test's event loop); exit code and output. */
function npmRun(args: string[], env: Record<string, string>) {
	return new Promise<{ code: number | null; output: string }>((done) => {
		const child = spawn('npm', ['run', '--silent', ...args], { env: { ...process.env, ...env } });
		let output = '';
		child.stdout.on('data', (chunk) => (output += chunk));
		child.stderr.on('data', (chunk) => (output += chunk));
		child.once('exit', (code) => done({ code, output }));
	});
}

describe('an old backup restored after a withdrawal', () => {
	it('makes the server warn at start and ledger:verify fail, naming the missing entry', async () => {
		app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir, RANKSEAL_DEMO: '0' });
		const [claim] = claims;
		const token = world.tokens.lake;
		const body = JSON.stringify({ checkId: claim.checkId });
		const issued = await apiPost(app.origin, token, `/claims/${claim.claimId}/certificates`, body);
		expect(issued.status).toBe(201);
		const backupDir = path.join(temporary('rankseal-backup-'), 'copy');
		const backup = await npmRun(['backup', '--', '--out', backupDir], {
			RANKSEAL_DATA_DIR: world.dataDir
		});
		expect(backup.code, backup.output).toBe(0);
		const reason = JSON.stringify({ reason: 'The coincidence window was set wrong.' });
		const withdrawn = await apiPost(app.origin, token, `/claims/${claim.claimId}/withdraw`, reason);
		expect(withdrawn.status).toBe(200);
		await app.stop();
		app = null;
		// The withdrawal notice ends with the checkpoint that counts the withdraw entry (entry 2).
		const [mail] = await readRows<{ text: string }>(
			world.dataDir,
			"SELECT text FROM outbox_mails WHERE kind = 'claim-withdrawn'"
		);
		const line = mail.text
			.split('\n')
			.find((l) => l.startsWith('{"format":"rankseal-checkpoint/1"'))!;
		expect(JSON.parse(line)).toMatchObject({ entries: 2 });
		const mailCheckpoint = path.join(temporary('rankseal-mail-'), 'checkpoint.json');
		writeFileSync(mailCheckpoint, line);

		const restored = temporary('rankseal-restored-');
		copyFileSync(
			path.join(world.dataDir, 'published-checkpoint.json'),
			path.join(restored, 'published-checkpoint.json')
		);
		const restore = await npmRun(['restore', '--', backupDir], { RANKSEAL_DATA_DIR: restored });
		expect(restore.code, restore.output).toBe(0);
		app = await startApp({ RANKSEAL_DATA_DIR: restored, RANKSEAL_DEMO: '0' });
		expect(app.output()).toMatch(
			/LEDGER WARNING: the ledger does not reach the last checkpoint this service published \(2 entries, [^)]+\): ledger entry 2: missing/
		);
		await app.stop();
		app = null;
		for (const args of [
			['ledger:verify'],
			['ledger:verify', '--', '--checkpoint', mailCheckpoint]
		]) {
			const run = await npmRun(args, { RANKSEAL_DATA_DIR: restored });
			expect(run.code, run.output).toBe(1);
			expect(run.output).toMatch(
				/^ledger BROKEN at ledger entry 2: missing: the ledger ends at entry 1/
			);
		}
	});
});
