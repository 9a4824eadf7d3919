/**
 * From the declared settings (K, π) to the sequence the bets run on: per trial
 * Z = 1{a = b}/(m π_t) looked up by code, or per block its matching fraction over m π_t.
 */
import type { CountsDataset, CountTable } from '../counts';
import { InputError } from '../counts';
import type { TrialsData } from './store';

export interface SettingsPlan {
	bases: number[];
	probabilities: number[];
	/** X_i = values[codes[i]]. */
	codes: Uint16Array | Uint32Array;
	values: Float64Array;
	/** The largest value X can take, 1/(m π_min). */
	xMax: number;
	meanX: number;
}

function declaredProbabilities(m: number, given: number[] | undefined): number[] {
	if (!given) return Array.from({ length: m }, () => 1 / m);
	if (given.length !== m)
		throw new InputError(`probabilities: ${given.length} given for ${m} bases; give one per basis`);
	given.forEach((p, k) => {
		if (!(Number.isFinite(p) && p > 0 && p < 1))
			throw new InputError(
				`probabilities: entry ${k + 1} must lie strictly between 0 and 1, got ${p}`
			);
	});
	const total = given.reduce((s, p) => s + p, 0);
	if (Math.abs(total - 1) > 1e-9)
		throw new InputError(`probabilities must add up to 1, got ${total}`);
	return given;
}

function declaredBases(data: TrialsData, given: number[] | undefined): number[] {
	const present = [...data.tables.keys()].sort((a, b) => a - b);
	if (!given) return present;
	if (new Set(given).size !== given.length)
		throw new InputError(`bases must be distinct, got ${given.join(',')}`);
	const outside = present.find((b) => !given.includes(b));
	if (outside !== undefined)
		throw new InputError(
			`the file has trials in basis ${outside}, which is not among the declared bases ${given.join(',')}`
		);
	return given;
}

export function settingsPlan(
	data: TrialsData,
	givenBases: number[] | undefined,
	givenProbabilities: number[] | undefined
): SettingsPlan {
	const bases = declaredBases(data, givenBases);
	const m = bases.length;
	const probabilities = declaredProbabilities(m, givenProbabilities);
	const weight = new Map(bases.map((b, k) => [b, 1 / (m * probabilities[k])]));
	const xMax = Math.max(...weight.values());
	let codes: Uint16Array | Uint32Array;
	let values: Float64Array;
	if (data.blocks) {
		const { basis, rows, matches } = data.blocks;
		codes = new Uint32Array(basis.length).map((_, j) => j);
		values = new Float64Array(basis.length).map(
			(_, j) => (matches[j] / rows[j]) * weight.get(basis[j])!
		);
	} else {
		codes = data.codes;
		values = new Float64Array(2 * (Math.max(...bases) + 1));
		for (const [b, w] of weight) values[2 * b + 1] = w;
	}
	let total = 0;
	for (let i = 0; i < codes.length; i++) total += values[codes[i]];
	return { bases, probabilities, codes, values, xMax, meanX: total / codes.length };
}

/** The trials summed into count tables: the i.i.d. certificate's input (every cell measured). */
export function iidDataset(data: TrialsData, bases: number[]): CountsDataset {
	const d = data.dimension;
	const tables: CountTable[] = [...bases]
		.sort((a, b) => a - b)
		.map((basis) => ({
			basis,
			counts: data.tables.get(basis) ?? new Float64Array(d * d),
			accidentals: null,
			durations: null,
			present: new Uint8Array(d * d).fill(1)
		}));
	return { dimension: d, tables };
}
