/** npm run plan (issue 19, part 3): the planner on the command line, its JSON and its refusals. */
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';

const run = promisify(execFile);

async function plan(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
	try {
		const { stdout, stderr } = await run('npm', ['run', '--silent', 'plan', '--', ...args]);
		return { code: 0, stdout, stderr };
	} catch (error) {
		const e = error as { code: number; stdout: string; stderr: string };
		return { code: e.code, stdout: e.stdout, stderr: e.stderr };
	}
}

describe('npm run plan', () => {
	it('gives every rung’s critical visibility, the curve against d and the trade-offs as JSON', async () => {
		const { code, stdout } = await plan([
			...['--method', 'steering-2mub', '--dimension', '4', '--schmidt-number', '4'],
			...['--visibility', '0.97', '--simulate', 'none', '--json']
		]);
		expect(code).toBe(0);
		const answer = JSON.parse(stdout);
		// β_3 in d = 4 (witnesses.md §4.2): η* = 0.93462, "about 95 %" in common practice.
		expect(answer.design.criticalVisibility).toBeCloseTo(0.934616, 6);
		expect(answer.rungs).toHaveLength(3);
		expect(answer.curve.at(-1).dimension).toBe(1024);
		expect(answer.alternatives.map((a: { method: string }) => a.method)).toContain(
			'mub-correlation'
		);
	});

	it('simulates counts by default and prints them readably', async () => {
		const { code, stdout } = await plan([
			...['--method', 'mub-correlation', '--dimension', '5', '--schmidt-number', '3'],
			...['--visibility', '0.95', '--bases', '0,1', '--simulate', 'requested']
		]);
		expect(code).toBe(0);
		expect(stdout).toMatch(/Critical visibility for this rung: 0\.\d{4}/);
		expect(stdout).toMatch(/\d+ per basis, \d+ in all \(power 0\.9\d\d\)/);
	});

	it('refuses bad input with exit 2 and one line naming the option', async () => {
		const { code, stderr } = await plan([
			...['--method', 'steering-2mub', '--dimension', '4', '--schmidt-number', '9'],
			...['--visibility', '0.9']
		]);
		expect(code).toBe(2);
		expect(stderr.trim()).toBe('rankseal: --schmidt-number: must not exceed the dimension');
	});

	it('plans fidelity-target with the declared λ (η* from §4.3′: F̃(v) = v + (1 − v)·w), refusing it without λ', async () => {
		const args = ['--method', 'fidelity-target', '--schmidt-number', '2', '--visibility', '0.9'];
		const out = await plan([...args, '--target', '0.863,0.485,0.143', '--json']);
		expect(out.code).toBe(0);
		const p = JSON.parse(out.stdout);
		// w from §4.3′'s check value F̃(0.9) = 0.8893355; η*_1 = (λ₀² − w)/(1 − w).
		const w = (0.8893355 - 0.9) / 0.1;
		const b1 = 0.863 ** 2 / (0.863 ** 2 + 0.485 ** 2 + 0.143 ** 2);
		expect(p.criticalVisibility).toBeCloseTo((b1 - w) / (1 - w), 6);
		expect(p.pairsNeeded).toBeGreaterThan(0);
		expect(p.power).toBeGreaterThanOrEqual(0.9);
		const refused = await plan(args);
		expect(refused.code).toBe(2);
		expect(refused.stderr).toMatch(/--target: give the declared target λ/);
	});
});
