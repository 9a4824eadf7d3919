/**
 * `npm run certify -- --method fidelity-target --target …` (witnesses.md §4.3′) on the contract's
 * isotropic example (d = 3, λ ∝ (.863, .485, .143), v = 0.9: F̃ = 0.8893355), as expected counts:
 * certifies Schmidt number ≥ 2 (B₁ = λ₀² ≈ 0.745 < F̃ < B₂ ≈ 0.980) and refuses bad targets.
 */
import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';

const run = promisify(execFile);
const lambdaRaw = [0.863, 0.485, 0.143];
const norm = Math.hypot(...lambdaRaw);
const lambda = lambdaRaw.map((x) => x / norm);
const [d, v] = [3, 0.9];

/** ⟨x ⊗ y*|Φ_λ⟩ = Σ_m λ_m conj(x_m)·y_m for the tilted vectors ṽ_a (side A), ṽ_b* (side B). */
function tiltedProbability(a: number, b: number): number {
	const s = lambda.reduce((p, x) => p + x, 0);
	let [re, im] = [0, 0];
	for (let m = 0; m < d; m++) {
		const angle = (2 * Math.PI * (b - a) * m) / d; // conj(ω^{am})·ω^{bm}
		const weight = (lambda[m] * lambda[m]) / s; // λ_m · √λ_m · √λ_m / Σλ
		re += weight * Math.cos(angle);
		im += weight * Math.sin(angle);
	}
	return v * (re * re + im * im) + (1 - v) / (d * d);
}

function countsFile(pairs = 1e7): string {
	const rows = ['basis,outcome_a,outcome_b,counts'];
	for (let a = 0; a < d; a++)
		for (let b = 0; b < d; b++) {
			const p = v * (a === b ? lambda[a] : 0) * (a === b ? lambda[a] : 0) + (1 - v) / (d * d);
			rows.push(`0,${a},${b},${Math.round(pairs * p)}`);
		}
	for (let a = 0; a < d; a++)
		for (let b = 0; b < d; b++)
			rows.push(`1,${a},${b},${Math.round(pairs * tiltedProbability(a, b))}`);
	const file = path.join(mkdtempSync(path.join(tmpdir(), 'rankseal-target-')), 'target.csv');
	writeFileSync(file, rows.join('\n') + '\n');
	return file;
}

async function cli(args: string[]) {
	try {
		const { stdout, stderr } = await run('npm', ['run', '--silent', 'certify', '--', ...args]);
		return { code: 0, stdout, stderr };
	} catch (error) {
		const e = error as { code: number; stdout: string; stderr: string };
		return { code: e.code, stdout: e.stdout, stderr: e.stderr };
	}
}

describe('npm run certify -- --method fidelity-target', () => {
	const file = countsFile();
	const base = ['--counts', file, '--dimension', '3', '--method', 'fidelity-target'];

	it('the isotropic example: F̃ = 0.8893355 at the data, Schmidt number ≥ 2 certified', async () => {
		const { code, stdout } = await cli([
			...base,
			'--target',
			lambdaRaw.join(','),
			'--claim',
			'2',
			'--json'
		]);
		expect(code).toBe(0);
		const out = JSON.parse(stdout);
		expect(out.statistic.value).toBeCloseTo(0.8893355, 5);
		expect(out.statistic.lower).toBeLessThan(out.statistic.value);
		expect(out.bounds[0].bound).toBeCloseTo(lambda[0] ** 2, 12);
		expect(out.certifiedSchmidtNumber).toBe(2);
		expect(out.claim.verdict).toBe('supported');
		// White-noise model: the effective visibility of these data is v itself.
		expect(out.effectiveVisibility).toBeCloseTo(v, 5);
	});

	it('refuses a missing or increasing target with exit 2', async () => {
		expect((await cli(base)).stderr).toMatch(
			/exactly one of --target l0,l1,… and --target-from RUN/
		);
		const bad = await cli([...base, '--target', '0.1,0.5,0.2']);
		expect(bad.code).toBe(2);
		expect(bad.stderr).toMatch(/target\[1\]: the coefficients must not increase/);
	});

	it('--target-from fits λ on a separate run (p₀(m, m) ∝ λ_m², §4.3′) and refuses the certified counts', async () => {
		const run = countsFile(1e6);
		const { code, stdout } = await cli([...base, '--target-from', run, '--claim', '2', '--json']);
		expect(code).toBe(0);
		const out = JSON.parse(stdout);
		// White noise flattens the diagonal: λ_m² ∝ v·λ_m² + (1 − v)/d² (rounded counts).
		const share = lambda.map((x) => v * x * x + (1 - v) / (d * d));
		const sum = share.reduce((a, b) => a + b, 0);
		out.targetFit.coefficients.forEach((x: number, m: number) =>
			expect(x).toBeCloseTo(Math.sqrt(share[m] / sum), 5)
		);
		expect(out.targetFit.runSha256).toMatch(/^[0-9a-f]{64}$/);
		expect(out.warnings[0]).toMatch(/fitted on a separate calibration run/);
		const same = await cli([...base, '--target-from', file]);
		expect(same.code).toBe(2);
		expect(same.stderr).toMatch(/very counts being certified/);
		const both = await cli([...base, '--target', lambdaRaw.join(','), '--target-from', run]);
		expect(both.code).toBe(2);
	});
});
