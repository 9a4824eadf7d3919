/**
 * Taking a check's result away (issue 8): the counts file exactly as stored with its SHA-256, the
 * result as JSON, and the one command line that reproduces the check, run here for real.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { reproduceCommand, shellWord } from '../../src/lib/evidence/command-line';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { checkCountsFile, checkResult } from '../../src/lib/server/checks/check-exports';
import { ConflictError, NotFoundError } from '../../src/lib/server/core/errors';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

let world: EvidenceWorld;
const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-take-away-'));

beforeAll(async () => (world = await evidenceWorld()));
afterAll(async () => {
	await world.ctx.close();
	rmSync(folder, { recursive: true, force: true });
});

describe('taking the result away', () => {
	it('gives the counts byte for byte, and a command whose --json output is the stored result', async () => {
		const check = await finishedCheck(world, 23);
		const { claimId } = world;
		const counts = await checkCountsFile(world.database, world.author, claimId, check.id);
		expect(sha256Hex(counts.bytes)).toBe(counts.sha256);
		expect(counts.sha256).toBe(check.result.inputSha256);
		const result = await checkResult(world.database, world.author, claimId, check.id);
		const command = reproduceCommand(result, counts.name);
		expect(command).toMatch(/^npm run --silent certify -- --counts run3\.csv --dimension 5 /);
		expect(command).toContain(`--seed 23`);
		// npm runs scripts in the checkout's root, so the file goes where the command names it.
		const args = command.split(' ').slice(5);
		const saved = path.join(folder, counts.name);
		writeFileSync(saved, counts.bytes);
		args[args.indexOf('--counts') + 1] = saved;
		const run = spawnSync('npx', ['tsx', 'src/cli/certify.ts', ...args], { encoding: 'utf8' });
		expect(run.status, run.stderr).toBe(0);
		expect(JSON.parse(run.stdout)).toEqual(JSON.parse(JSON.stringify(result)));
	});

	it('names the background subtraction when the result had it', async () => {
		const check = await finishedCheck(world, 24);
		const subtracted = { ...check.result, backgroundSubtracted: true };
		expect(reproduceCommand(subtracted, 'a.csv')).toContain(' --subtract-accidentals');
		expect(reproduceCommand(check.result, 'a.csv')).not.toContain('--subtract-accidentals');
	});

	it('quotes a file name so that a POSIX shell reads it back unchanged', () => {
		// The reference is /bin/sh itself (POSIX.1-2017 XCU §2.2.2: single quotes keep every byte).
		for (const name of ["it's run 3.csv", 'plain.csv', 'a$b`c"d\\e.csv', 'tab\there.json']) {
			const echoed = execFileSync('sh', ['-c', `printf %s ${shellWord(name)}`], {
				encoding: 'utf8'
			});
			expect(echoed).toBe(name);
		}
	});

	it('hides another group’s check and refuses an unfinished one', async () => {
		const check = await finishedCheck(world, 25);
		const { claimId, database } = world;
		await expect(
			checkCountsFile(database, world.outsider, claimId, check.id)
		).rejects.toBeInstanceOf(NotFoundError);
		await database.models.Check.update({ status: 'running' }, { where: { id: check.id } });
		await expect(checkResult(database, world.author, claimId, check.id)).rejects.toBeInstanceOf(
			ConflictError
		);
	});
});
