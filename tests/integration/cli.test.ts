import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';
import { certify, parseCounts, sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { sha256Hex } from '../../src/lib/evidence/hash';

const run = promisify(execFile);
const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-cli-'));
const example = path.resolve('tests/fixtures/example-d5-three-bases.csv');

async function cli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
	try {
		const { stdout, stderr } = await run('npm', ['run', '--silent', 'certify', '--', ...args]);
		return { code: 0, stdout, stderr };
	} catch (error) {
		const e = error as { code: number; stdout: string; stderr: string };
		return { code: e.code, stdout: e.stdout, stderr: e.stderr };
	}
}

function write(name: string, text: string): string {
	const file = path.join(folder, name);
	writeFileSync(file, text);
	return file;
}

describe('npm run certify (the command line of issue 2)', () => {
	const d7 = write(
		'd7.csv',
		toCountsCsv(sampledCounts(states.isotropic(7, 0.9), [0, 1], 100_000, 5))
	);

	it('prints one JSON object with the specified fields, the file hash and the verdict', async () => {
		const { code, stdout } = await cli([
			'--counts',
			d7,
			'--dimension',
			'7',
			'--method',
			'steering-2mub',
			'--claim',
			'5',
			'--json'
		]);
		expect(code).toBe(0);
		const out = JSON.parse(stdout);
		expect(out).toMatchObject({
			method: 'steering-2mub',
			dimension: 7,
			bases: [0, 1],
			confidence: 0.99865,
			resamples: 10000,
			seed: 1
		});
		expect(Object.keys(out.statistic)).toEqual(
			expect.arrayContaining(['value', 'standardError', 'lower', 'interval95'])
		);
		expect(out.bounds).toHaveLength(6);
		expect(out.bounds[0]).toMatchObject({ upToSchmidtNumber: 1, bound: 1 + 1 / Math.sqrt(7) });
		expect(out.inputSha256).toBe(sha256Hex(readFileSync(d7)));
		expect(out.claim.schmidtNumber).toBe(5);
		// The same computation in-process, with the same defaults, gives the same numbers.
		const direct = certify(parseCounts(readFileSync(d7), 7), { method: 'steering-2mub', claim: 5 });
		expect(out.statistic.lower).toBe(direct.statistic.lower);
		expect(out.certifiedSchmidtNumber).toBe(direct.certifiedSchmidtNumber);
		expect(out.claim.verdict).toBe(
			direct.certifiedSchmidtNumber >= 5 ? 'supported' : 'not supported'
		);
	});

	it('uses every basis in the file by default and honours --bases, --seed, --resamples, --confidence', async () => {
		const all = JSON.parse(
			(
				await cli([
					'--counts',
					example,
					'--dimension',
					'5',
					'--method',
					'mub-correlation',
					'--json'
				])
			).stdout
		);
		expect(all.bases).toEqual([0, 1, 2]);
		const some = JSON.parse(
			(
				await cli([
					'--counts',
					example,
					'--dimension',
					'5',
					'--method',
					'mub-correlation',
					'--bases',
					'0,2',
					'--seed',
					'9',
					'--resamples',
					'2000',
					'--confidence',
					'0.95',
					'--json'
				])
			).stdout
		);
		expect(some).toMatchObject({
			bases: [0, 2],
			seed: 9,
			resamples: 2000,
			confidence: 0.95,
			claim: null
		});
	});

	it('prints a readable report without --json', async () => {
		const { code, stdout } = await cli([
			'--counts',
			example,
			'--dimension',
			'5',
			'--method',
			'fidelity-two-basis',
			'--claim',
			'3'
		]);
		expect(code).toBe(0);
		expect(stdout).toMatch(/certified Schmidt number\s+≥ \d/);
		expect(stdout).toMatch(/not a substitute for peer review/);
	});

	it('gives the same result on 1 and 3 worker threads as certify() in one thread (engine 2.1.0 blocks)', async () => {
		// Blocks of resamples each draw from their own stream, so the thread count cannot matter.
		const args = ['--counts', d7, '--dimension', '7', '--method', 'fidelity-two-basis'];
		const more = ['--resamples', '4500', '--seed', '12', '--json'];
		const one = await cli([...args, ...more, '--threads', '1']);
		const three = await cli([...args, ...more, '--threads', '3']);
		expect(one.code).toBe(0);
		expect(three.stdout).toBe(one.stdout);
		const bytes = readFileSync(d7);
		const inProcess = certify(parseCounts(bytes, 7), {
			method: 'fidelity-two-basis',
			resamples: 4500,
			seed: 12,
			inputSha256: sha256Hex(bytes)
		});
		expect(JSON.parse(one.stdout)).toEqual(JSON.parse(JSON.stringify(inProcess)));
	});

	const bad: [string, string[], RegExp][] = [
		[
			'a bad count',
			[
				'--counts',
				write('bad.csv', 'basis,outcome_a,outcome_b,counts\n0,0,0,12\n0,0,1,-4\n'),
				'--dimension',
				'5',
				'--method',
				'steering-2mub'
			],
			/^rankseal: line 3, column 4: /
		],
		[
			'an unknown method',
			['--counts', example, '--dimension', '5', '--method', 'guess'],
			/--method must be one of/
		],
		[
			'a missing file',
			[
				'--counts',
				path.join(folder, 'absent.csv'),
				'--dimension',
				'5',
				'--method',
				'steering-2mub'
			],
			/cannot read --counts/
		],
		[
			'a missing option',
			['--counts', example, '--method', 'steering-2mub'],
			/--dimension is required/
		],
		[
			'an unknown option',
			['--counts', example, '--dimension', '5', '--method', 'steering-2mub', '--fast'],
			/Unknown option '--fast'/
		],
		[
			'a dimension the file contradicts',
			['--counts', example, '--dimension', '3', '--method', 'steering-2mub'],
			/outcome_a 3 is outside 0..2|outcome_b 3 is outside 0..2/
		]
	];
	for (const [name, args, message] of bad) {
		it(`exits 2 with one line on stderr for ${name}`, async () => {
			const { code, stdout, stderr } = await cli(args);
			expect(code).toBe(2);
			expect(stdout).toBe('');
			expect(stderr.trim().split('\n')).toHaveLength(1);
			expect(stderr).toMatch(message);
		});
	}
});
