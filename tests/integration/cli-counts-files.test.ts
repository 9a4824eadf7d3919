/**
 * `npm run certify` with several `--counts` files (issue 18): bare grids with `--file-basis`
 * give the same numbers as the same counts in one long-form file, and the input SHA-256 of the
 * counts set the service stores for the same upload; a bad second file is named with its line.
 */
import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { describe, expect, it, vi } from 'vitest';
import { certify, parseCounts, sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { writeCountsSet } from '../../src/lib/certify/counts-set';
import { sha256Hex } from '../../src/lib/evidence/hash';

// A safety limit for the launcher's first bundle build on a busy machine, not a speed check.
vi.setConfig({ testTimeout: 600_000 });

const run = promisify(execFile);
const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-cli-files-'));
const d = 7;
const data = sampledCounts(states.isotropic(d, 0.9), [0, 1], 100_000, 8);
const grid = (t: number) =>
	Array.from({ length: d }, (_, a) =>
		[...data.tables[t].counts.subarray(a * d, a * d + d)].join('\t')
	).join('\n') + '\n';

async function cli(args: string[]) {
	try {
		const { stdout, stderr } = await run('npm', ['run', '--silent', 'certify', '--', ...args]);
		return { code: 0, stdout, stderr };
	} catch (error) {
		return error as { code: number; stdout: string; stderr: string };
	}
}

function write(name: string, text: string): string {
	writeFileSync(path.join(folder, name), text);
	return path.join(folder, name);
}

const method = ['--dimension', '7', '--method', 'steering-2mub', '--json'];

describe('several --counts files', () => {
	it('read as one dataset: the long form’s numbers, the service’s input SHA-256', async () => {
		const h = write('h.tsv', grid(0));
		const v = write('v.tsv', grid(1));
		const { code, stdout } = await cli([
			'--counts',
			h,
			'--counts',
			v,
			'--file-basis',
			'0,1',
			...method
		]);
		expect(code).toBe(0);
		const out = JSON.parse(stdout);
		const set = writeCountsSet([
			{ name: 'h.tsv', bytes: new TextEncoder().encode(grid(0)), basis: 0 },
			{ name: 'v.tsv', bytes: new TextEncoder().encode(grid(1)), basis: 1 }
		]);
		expect(out.inputSha256).toBe(sha256Hex(set));
		const inProcess = certify(parseCounts(toCountsCsv(data), d), {
			method: 'steering-2mub',
			inputSha256: out.inputSha256
		});
		expect(out.statistic).toEqual(JSON.parse(JSON.stringify(inProcess.statistic)));
		expect(out.certifiedSchmidtNumber).toBe(inProcess.certifiedSchmidtNumber);
	});

	it('name the bad file and its line, and want one --file-basis value per file', async () => {
		const h = write('h2.tsv', grid(0));
		const lines = grid(1).split('\n');
		lines[2] = lines[2].replace(/^(\d+)\t/, '$1\tz');
		const v = write('v2.tsv', lines.join('\n'));
		const bad = await cli(['--counts', h, '--counts', v, '--file-basis', '0,1', ...method]);
		expect(bad.code).toBe(2);
		expect(bad.stderr).toContain(
			"line 3, column 2: in v2.tsv (file 2 of 2): counts must be a non-negative whole number, got 'z"
		);
		const short = await cli(['--counts', h, '--counts', v, '--file-basis', '0', ...method]);
		expect(short.code).toBe(2);
		expect(short.stderr).toContain('--file-basis gives 1 value(s) for 2 --counts file(s)');
	});
});
