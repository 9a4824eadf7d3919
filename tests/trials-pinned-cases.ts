/**
 * Seeded time-ordered trials files whose whole check result is pinned in
 * tests/fixtures/trials-pinned-results.json (written once by the engine before the speed-up of
 * issue 20, so that faster code is held to the old numbers bit for bit).
 */
import {
	isotropicTrialsCsv,
	mulberry32,
	type TrialsMode,
	type TrialsOptions
} from '../src/lib/certify/trials';

export interface PinnedCase {
	name: string;
	csv: string;
	dimension: number;
	mode: TrialsMode;
	options: TrialsOptions;
}

/** Rows `basis,a,b` with setting probabilities `pi` over bases 0.., visibility by row index. */
function rows(d: number, pi: number[], n: number, seed: number, visibility: (i: number) => number) {
	const random = mulberry32(seed);
	const out: number[][] = [];
	for (let i = 0; i < n; i++) {
		let u = random();
		let basis = 0;
		while (basis < pi.length - 1 && u >= pi[basis]) u -= pi[basis++];
		const a = Math.floor(random() * d);
		const b = random() < visibility(i) ? a : Math.floor(random() * d);
		out.push([basis, a, b]);
	}
	return out;
}

/** Columns reordered, a time column, CRLF, a BOM and comment lines: the parser's slower paths. */
function oddLayout(): string {
	const body = rows(5, [0.3, 0.7], 20_000, 21, () => 0.7).map(
		([t, a, b], i) =>
			`${i % 7 === 0 ? ' \t' : ''}${b},${(i * 0.001).toFixed(3)},${t},${a}${i % 5000 === 0 ? '\r\n# pause' : ''}`
	);
	return '\ufeff# lab 3\r\noutcome_b,time_s,basis,outcome_a\r\n' + body.join('\r\n') + '\r\n';
}

/** Blocks of 5 rows, one basis per block, three bases. */
function blocks(): string {
	const random = mulberry32(31);
	const lines = ['basis,outcome_a,outcome_b,block'];
	for (let j = 0; j < 3000; j++) {
		const basis = Math.floor(random() * 3);
		for (const [, a, b] of rows(5, [1], 5, 1000 + j, () => 0.6))
			lines.push(`${basis},${a},${b},${j}`);
	}
	return lines.join('\n') + '\n';
}

/** Strong correlations first, then none: the upper rungs' wealth falls far below 10⁻¹⁰⁰. */
function drift(): string {
	const body = rows(5, [0.5, 0.5], 100_000, 41, (i) => (i < 40_000 ? 0.95 : 0));
	return 'basis,outcome_a,outcome_b\n' + body.map((r) => r.join(',')).join('\n');
}

export function pinnedCases(): PinnedCase[] {
	return [
		{
			name: 'd7-three-bases',
			csv: isotropicTrialsCsv(7, 0.8, [0, 1, 2], 30_000, 5),
			dimension: 7,
			mode: 'trials',
			options: { method: 'mub-correlation' }
		},
		{
			name: 'd7-short-run',
			csv: isotropicTrialsCsv(7, 0.8, [0, 1, 2], 400, 6),
			dimension: 7,
			mode: 'trials',
			options: { method: 'mub-correlation' }
		},
		{
			name: 'd31-two-bases-bench-like',
			csv: isotropicTrialsCsv(31, 0.9, [0, 1], 200_000, 11),
			dimension: 31,
			mode: 'trials',
			options: { method: 'mub-correlation', inputSha256: 'ab'.repeat(32) }
		},
		{
			name: 'd5-odd-layout-declared-probabilities',
			csv: oddLayout(),
			dimension: 5,
			mode: 'trials',
			options: {
				method: 'steering-2mub',
				bases: [0, 1],
				probabilities: [0.3, 0.7],
				confidence: 0.99
			}
		},
		{
			name: 'd5-uniform-settings-declared-skewed',
			csv: oddLayout(),
			dimension: 5,
			mode: 'trials',
			options: { method: 'mub-correlation', bases: [0, 1, 2] }
		},
		{
			name: 'd5-blocks',
			csv: blocks(),
			dimension: 5,
			mode: 'blocks',
			options: { method: 'mub-correlation' }
		},
		{
			name: 'd5-drift',
			csv: drift(),
			dimension: 5,
			mode: 'trials',
			options: { method: 'mub-correlation' }
		}
	];
}
