/**
 * `--calibration FILE` on the command line (witnesses.md §4.4): the d = 3 example of issue 22 — a
 * product state measured in bases within 2 % of unbiased — certifies Schmidt number ≥ 2 without
 * its calibration (with a calibration tolerance below 0.02) and nothing with it.
 */
import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { reproduceCommand } from '../../src/lib/evidence/command-line';

const run = promisify(execFile);
const counts = path.resolve('tests/fixtures/calibrated-d3-product.csv');
const calibration = path.resolve('tests/fixtures/calibrated-d3-bases.json');
const base = [
	'--counts',
	counts,
	'--dimension',
	'3',
	'--method',
	'mub-correlation',
	'--claim',
	'2'
];

async function cli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
	try {
		const { stdout, stderr } = await run('npm', ['run', '--silent', 'certify', '--', ...args]);
		return { code: 0, stdout, stderr };
	} catch (error) {
		const e = error as { code: number; stdout: string; stderr: string };
		return { code: e.code, stdout: e.stdout, stderr: e.stderr };
	}
}

describe('npm run certify -- --calibration FILE', () => {
	it('without the calibration: Schmidt number ≥ 2, holding only for bases unbiased to within < 2 %', async () => {
		const { code, stdout } = await cli([...base, '--json']);
		expect(code).toBe(0);
		const out = JSON.parse(stdout);
		expect(out.certifiedSchmidtNumber).toBe(2);
		expect(out.calibration).toBeNull();
		expect(out.calibrationTolerance.value).toBeGreaterThan(0);
		expect(out.calibrationTolerance.value).toBeLessThan(0.02);
		expect(out.calibrationTolerance.note).toMatch(/holds for bases unbiased to within 0\.\d+ %/);
	});

	it('with it: the ladder uses μ of the measured overlaps and nothing is certified', async () => {
		const { code, stdout } = await cli([...base, '--calibration', calibration, '--json']);
		expect(code).toBe(0);
		const out = JSON.parse(stdout);
		expect(out.certifiedSchmidtNumber).toBe(1);
		expect(out.claim.verdict).toBe('not supported');
		expect(out.calibration.sha256).toBe(sha256Hex(readFileSync(calibration)));
		expect(out.bounds[0].bound).toBeCloseTo(1.6824093, 6);
		// The check page's take-away command names the calibration; run as printed it gives the same JSON.
		const command = reproduceCommand(out, counts, calibration);
		expect(command).toContain(`--calibration ${calibration}`);
		const words = command.replace('npm run --silent certify -- ', '').split(' ');
		expect(JSON.parse((await cli(words)).stdout)).toEqual(out);
		const readable = await cli([...base, '--calibration', calibration]);
		expect(readable.stdout).toMatch(/calibrated bases\s+μ ≤ 1\.02361/);
	});

	it('a calibration that is not orthonormal is refused with exit 2, naming the basis', async () => {
		const bad = JSON.parse(readFileSync(calibration, 'utf8'));
		bad.bases[2].vectors[1][0][1] += 0.01;
		const file = path.join(mkdtempSync(path.join(tmpdir(), 'rankseal-cal-')), 'bad.json');
		writeFileSync(file, JSON.stringify(bad));
		const { code, stderr } = await cli([...base, '--calibration', file]);
		expect(code).toBe(2);
		expect(stderr).toMatch(/calibration basis 2: not orthonormal/);
	});
});
