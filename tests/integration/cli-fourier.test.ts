/**
 * `npm run --silent certify -- --fourier cyclic|field` in d = 9 on files made from exact tables
 * (mathjs, tests/unit/exact-states.ts), against a direct evaluation of the published bound
 * (Bavaresco et al., Nat. Phys. 14, 1032 (2018)); issue 6 §5 "Done means".
 */
import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { afterAll, describe, expect, it } from 'vitest';
import {
	countsJson,
	directFidelityBound,
	exactTables,
	stateNearPhi,
	type Convention
} from '../unit/exact-states';

const run = promisify(execFile);
const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-cli-fourier-'));
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

/** Long-form CSV of the exact tables scaled to `total` pairs per basis (product.md format). */
function countsCsv(p: Float64Array[], d: number, total: number): string {
	const rows = ['basis,outcome_a,outcome_b,counts'];
	p.forEach((table, t) => {
		for (let c = 0; c < d * d; c++)
			rows.push(`${t},${Math.floor(c / d)},${c % d},${Math.round(table[c] * total)}`);
	});
	return rows.join('\n') + '\n';
}

describe('the command line with --fourier in d = 9', () => {
	const d = 9;
	const rho = stateNearPhi(d, 4242, 0.9, 3);
	const exact = { cyclic: exactTables(rho, d, 'cyclic'), field: exactTables(rho, d, 'field') };
	const files = {
		cyclic: path.join(folder, 'd9-cyclic.csv'),
		field: path.join(folder, 'd9-field.json')
	};
	writeFileSync(files.cyclic, countsCsv(exact.cyclic, d, 1e9));
	writeFileSync(files.field, countsJson(exact.field, d, 1e9, 'field'));

	for (const convention of ['cyclic', 'field'] as Convention[]) {
		it(`--fourier ${convention} agrees with the direct evaluation and records the convention`, async () => {
			const { code, stdout } = await cli([
				...['--counts', files[convention], '--dimension', '9', '--method', 'fidelity-two-basis'],
				...['--fourier', convention, '--resamples', '200', '--json']
			]);
			expect(code).toBe(0);
			const out = JSON.parse(stdout);
			expect(out.fourier).toBe(convention);
			// 10⁹ pairs per basis: rounding moves F̃ by well under 10⁻⁶.
			expect(out.statistic.plugInValue).toBeCloseTo(
				directFidelityBound(exact[convention], d, convention),
				6
			);
		});
	}

	it('the readable report names the convention next to the bases', async () => {
		const { code, stdout } = await cli([
			...['--counts', files.field, '--dimension', '9', '--method', 'fidelity-two-basis'],
			...['--fourier', 'field', '--resamples', '200']
		]);
		expect(code).toBe(0);
		expect(stdout).toMatch(/Fourier basis\s+field \(GF\(9\)/);
	});

	it('refuses a file that declares another convention, naming $.fourier (exit 2)', async () => {
		const { code, stderr } = await cli([
			...['--counts', files.field, '--dimension', '9', '--method', 'fidelity-two-basis'],
			...['--fourier', 'cyclic']
		]);
		expect(code).toBe(2);
		expect(stderr).toMatch(
			/line 1, column \d+: \$\.fourier: the file declares "field" but --fourier cyclic/
		);
	});

	it('--fourier field in d = 6 is a clear exit-2 error', async () => {
		const six = path.join(folder, 'd6.csv');
		writeFileSync(six, countsCsv(exactTables(stateNearPhi(6, 1, 0.9, 2), 6, 'cyclic'), 6, 1e6));
		const { code, stdout, stderr } = await cli([
			...['--counts', six, '--dimension', '6', '--method', 'fidelity-two-basis'],
			...['--fourier', 'field']
		]);
		expect(code).toBe(2);
		expect(stdout).toBe('');
		expect(stderr).toMatch(
			/^rankseal: --fourier: fourier=field needs a prime-power dimension.*6 is not one/
		);
	});

	it('--help documents --fourier', async () => {
		const { code, stdout } = await cli(['--help']);
		expect(code).toBe(0);
		expect(stdout).toMatch(/--fourier cyclic\|field/);
	});
});
