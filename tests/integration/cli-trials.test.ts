/**
 * `npm run --silent certify -- --trials FILE` (issue 20): the label, the JSON's p-values equal to
 * the engine's to the bit, blocks mode, and the refusal of predictable settings (exit status 2).
 */
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { gzipSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import {
	certifyTrials,
	isotropicTrialsCsv,
	mulberry32,
	parseTrials,
	TRIALS_LABEL
} from '../../src/lib/certify/trials';

const run = promisify(execFile);
const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-cli-trials-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

async function cli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
	try {
		const { stdout, stderr } = await run('npm', ['run', '--silent', 'certify', '--', ...args]);
		return { code: 0, stdout, stderr };
	} catch (error) {
		const e = error as { code: number; stdout: string; stderr: string };
		return { code: e.code, stdout: e.stdout, stderr: e.stderr };
	}
}

function file(name: string, text: string): string {
	const where = path.join(folder, name);
	writeFileSync(where, text);
	return where;
}

describe('certify --trials', () => {
	it('prints the label and the p-values of the engine, bit for bit', async () => {
		const trials = file('t8.csv', isotropicTrialsCsv(8, 0.85, [0, 1], 20_000, 2));
		const args = ['--trials', trials, '--dimension', '8', '--method', 'mub-correlation'];
		const text = await cli(args);
		expect(text.code).toBe(0);
		expect(text.stdout).toContain(TRIALS_LABEL);
		const json = await cli([...args, '--json']);
		const engine = certifyTrials(parseTrials(readFileSync(trials), 8, 'trials'), {
			method: 'mub-correlation'
		});
		const printed = JSON.parse(json.stdout);
		expect(printed.rungs.map((r: { log10P: number }) => r.log10P)).toEqual(
			engine.rungs.map((r) => r.log10P)
		);
		expect(printed.certifiedSchmidtNumber).toBe(engine.certifiedSchmidtNumber);
	});

	it('reads a gzip-compressed file (RFC 1952, node zlib) as the plain one, naming the gzip file’s SHA-256', async () => {
		const text = isotropicTrialsCsv(5, 0.9, [0, 1], 5000, 3);
		const plain = file('t5.csv', text);
		const gz = path.join(folder, 't5.csv.gz');
		writeFileSync(gz, gzipSync(text));
		const args = ['--dimension', '5', '--method', 'mub-correlation', '--json'];
		const one = await cli(['--trials', plain, ...args]);
		const two = await cli(['--trials', gz, ...args]);
		expect(two.code).toBe(0);
		const [a, b] = [JSON.parse(one.stdout), JSON.parse(two.stdout)];
		expect(b.rungs).toEqual(a.rungs);
		expect(b.inputSha256).toBe(createHash('sha256').update(readFileSync(gz)).digest('hex'));
	});

	it('blocks mode says its condition', async () => {
		const random = mulberry32(9);
		const rows = ['basis,outcome_a,outcome_b,block'];
		for (let j = 0; j < 400; j++) {
			const t = random() < 0.5 ? 0 : 1;
			for (let k = 0; k < 20; k++) {
				const a = Math.floor(random() * 5);
				rows.push(`${t},${a},${random() < 0.9 ? a : Math.floor(random() * 5)},${j}`);
			}
		}
		const trials = file('blocks.csv', rows.join('\n') + '\n');
		const out = await cli([
			'--trials',
			trials,
			'--dimension',
			'5',
			'--method',
			'mub-correlation',
			'--mode',
			'blocks'
		]);
		expect(out.code).toBe(0);
		expect(out.stdout).toMatch(/8000 trials in 400 blocks/);
		expect(out.stdout).toMatch(/source receives nothing from the detectors during the block/);
	});

	it('refuses predictable settings with exit status 2 and says why', async () => {
		const rows = Array.from({ length: 2000 }, (_, i) => `${i % 2},${i % 8},${i % 8}`);
		const trials = file('predictable.csv', `basis,outcome_a,outcome_b\n${rows.join('\n')}\n`);
		const out = await cli(['--trials', trials, '--dimension', '8', '--method', 'mub-correlation']);
		expect(out.code).toBe(2);
		expect(out.stderr).toMatch(/refused: The settings do not look random/);
	});

	it('bad input: one line naming line and column, exit status 2', async () => {
		const trials = file('bad.csv', 'basis,outcome_a,outcome_b\n0,1,9\n');
		const out = await cli(['--trials', trials, '--dimension', '8', '--method', 'mub-correlation']);
		expect(out.code).toBe(2);
		expect(out.stderr.trim()).toBe('rankseal: line 2, column 3: outcome_b must be 0..7, got 9');
	});
});
