/**
 * The canonical counts as long-form CSV (product.md's layout: one row per basis and outcome pair
 * the upload holds), written from the same parsed counts as canonicalCountsText, which alone
 * stays the counts' identity. The verifier reads the CSV back with the counts reader and compares
 * it cell by cell with the uploaded counts.
 */
import type { CountsDataset, CountTable } from '../certify';
import { TableBudget } from '../certify/counts-budget';
import { parseCountsCsv } from '../certify/counts-csv';

/** A table without the column another table has is written with the neutral value. */
const NEUTRAL = { accidentals: 0, durations: 1 } as const;

function rowsOf(table: CountTable, d: number, extras: (keyof typeof NEUTRAL)[]): string {
	const lines: string[] = [];
	for (let a = 0; a < d; a++) {
		let line = '';
		for (let b = 0; b < d; b++) {
			const cell = a * d + b;
			if (!table.present[cell]) continue;
			line += `${table.basis},${a},${b},${table.counts[cell]}`;
			for (const kind of extras) line += `,${table[kind]?.[cell] ?? NEUTRAL[kind]}`;
			line += '\n';
		}
		lines.push(line);
	}
	return lines.join('');
}

/** The long-form CSV text: header, then the rows basis by basis, outcome_a then outcome_b. */
export function longFormCountsText(dataset: CountsDataset): string {
	const d = dataset.dimension;
	const extras = (['accidentals', 'durations'] as const).filter((kind) =>
		dataset.tables.some((t) => t[kind] !== null)
	);
	const names = extras.map((kind) => (kind === 'durations' ? 'duration_s' : kind));
	const declared = dataset.declaredFourier?.convention;
	const head = [
		`# Canonical counts, long form: d = ${d}, ${dataset.tables.length} bases (Rankseal evidence)`,
		...(declared ? [`# fourier: ${declared} (declared by the uploaded file)`] : []),
		['basis', 'outcome_a', 'outcome_b', 'counts', ...names].join(',')
	];
	return head.join('\n') + '\n' + dataset.tables.map((t) => rowsOf(t, d, extras)).join('');
}

function sameValues(
	x: Float64Array | null,
	y: Float64Array | null,
	neutral: number,
	present: Uint8Array
): boolean {
	for (let i = 0; i < present.length; i++)
		if (present[i] && (x?.[i] ?? neutral) !== (y?.[i] ?? neutral)) return false;
	return true;
}

/** Where the two tables differ, in words; null when every cell agrees. */
function tableProblem(read: CountTable, expected: CountTable, d: number): string | null {
	for (let i = 0; i < d * d; i++) {
		const where = `basis ${expected.basis}, outcome_a=${Math.floor(i / d)}, outcome_b=${i % d}`;
		if (read.present[i] !== expected.present[i])
			return `${where}: the cell is ${expected.present[i] ? 'missing' : 'not in the upload'}`;
		if (expected.present[i] && read.counts[i] !== expected.counts[i])
			return `${where}: counts ${read.counts[i]}, the upload has ${expected.counts[i]}`;
	}
	const { accidentals, durations } = NEUTRAL;
	if (!sameValues(read.accidentals, expected.accidentals, accidentals, expected.present))
		return `basis ${expected.basis}: its accidentals differ from the upload`;
	if (!sameValues(read.durations, expected.durations, durations, expected.present))
		return `basis ${expected.basis}: its durations differ from the upload`;
	return null;
}

/**
 * Reads the long-form CSV and compares it with the uploaded counts; the words of the first
 * difference, or null. Its tables may hold no more numbers than the upload's with both extras.
 */
export function longFormProblem(csv: Uint8Array, uploaded: CountsDataset): string | null {
	const d = uploaded.dimension;
	let read: CountsDataset;
	try {
		const budget = new TableBudget(3 * Math.max(1, uploaded.tables.length) * d * d);
		read = parseCountsCsv(csv, d, budget, Number.POSITIVE_INFINITY);
	} catch (error) {
		return `it cannot be read as long-form counts: ${(error as Error).message}`;
	}
	const bases = (x: CountsDataset) => x.tables.map((t) => t.basis).join(', ');
	if (bases(read) !== bases(uploaded))
		return `it holds bases ${bases(read)}; the upload holds ${bases(uploaded)}`;
	for (let i = 0; i < read.tables.length; i++) {
		const problem = tableProblem(read.tables[i], uploaded.tables[i], d);
		if (problem) return problem;
	}
	return null;
}
