/**
 * Synthetic count tables for tests and the demo. States are
 *   ρ = η·[v·|ψ⟩⟨ψ| + (1 − v)·Σ_m |c_m|² |mm⟩⟨mm|] + (1 − η)·𝟙/d²,  |ψ⟩ = Σ_m c_m |mm⟩,
 * covering isotropic (c uniform, v = 1), dephased (v < 1), Schmidt-rank-limited Φ_r (r equal
 * coefficients) and any non-uniform Schmidt spectrum. Side B measures the conjugate basis
 * (witnesses.md §1), so ⟨a_t|⊗⟨b_t*|ψ⟩ = Σ_m c_m conj(a_m) b_m. Bases follow the given Fourier
 * convention (bases.ts; default cyclic).
 */
import { basisVectors, DEFAULT_FOURIER, type FourierConvention } from './bases';
import type { CountsDataset, CountTable } from './counts';
import { PoissonSampler, prepareMeans } from './poisson';

export interface SimulatedState {
	dimension: number;
	/** Schmidt coefficients c_m (normalised here); length ≤ dimension. */
	schmidtCoefficients: number[];
	/** White-noise visibility η. */
	visibility: number;
	/** Kept fraction v of the coherences between |mm⟩ terms (1: none lost). */
	coherence: number;
}

export const states = {
	isotropic: (d: number, visibility: number): SimulatedState => ({
		dimension: d,
		schmidtCoefficients: new Array(d).fill(1),
		visibility,
		coherence: 1
	}),
	rankLimited: (d: number, r: number, visibility = 1): SimulatedState => ({
		dimension: d,
		schmidtCoefficients: new Array(r).fill(1),
		visibility,
		coherence: 1
	}),
	dephased: (d: number, coherence: number, visibility = 1): SimulatedState => ({
		dimension: d,
		schmidtCoefficients: new Array(d).fill(1),
		visibility,
		coherence
	}),
	spectrum: (d: number, coefficients: number[], visibility = 1): SimulatedState => ({
		dimension: d,
		schmidtCoefficients: coefficients,
		visibility,
		coherence: 1
	})
};

/** Exact outcome probabilities p_t(a, b), cell a·d + b, of the state in basis t. */
export function outcomeProbabilities(
	state: SimulatedState,
	t: number,
	fourier: FourierConvention = DEFAULT_FOURIER
): Float64Array {
	const d = state.dimension;
	const norm = Math.sqrt(state.schmidtCoefficients.reduce((s, c) => s + c * c, 0));
	const c = state.schmidtCoefficients.map((x) => x / norm);
	const { re, im } = basisVectors(d, t, fourier);
	const { visibility: eta, coherence: v } = state;
	const p = new Float64Array(d * d);
	for (let a = 0; a < d; a++) {
		for (let b = 0; b < d; b++) {
			let ampRe = 0;
			let ampIm = 0;
			let dephased = 0;
			for (let m = 0; m < c.length; m++) {
				const ar = re[a * d + m],
					ai = -im[a * d + m];
				const br = re[b * d + m],
					bi = im[b * d + m];
				ampRe += c[m] * (ar * br - ai * bi);
				ampIm += c[m] * (ar * bi + ai * br);
				dephased += c[m] * c[m] * (ar * ar + ai * ai) * (br * br + bi * bi);
			}
			const pure = v * (ampRe * ampRe + ampIm * ampIm) + (1 - v) * dephased;
			p[a * d + b] = eta * pure + (1 - eta) / (d * d);
		}
	}
	return p;
}

function tableFrom(basis: number, counts: Float64Array): CountTable {
	return {
		basis,
		counts,
		accidentals: null,
		durations: null,
		present: new Uint8Array(counts.length).fill(1)
	};
}

/** Expected counts, rounded to whole numbers, with `countsPerBasis` pairs in each basis. */
export function expectedCounts(
	state: SimulatedState,
	bases: number[],
	countsPerBasis: number,
	fourier: FourierConvention = DEFAULT_FOURIER
): CountsDataset {
	return {
		dimension: state.dimension,
		tables: bases.map((t) =>
			tableFrom(
				t,
				outcomeProbabilities(state, t, fourier).map((p) => Math.round(p * countsPerBasis))
			)
		)
	};
}

/** Poisson-distributed counts around the expected ones, from a seed. */
export function sampledCounts(
	state: SimulatedState,
	bases: number[],
	countsPerBasis: number,
	seed: number,
	fourier: FourierConvention = DEFAULT_FOURIER
): CountsDataset {
	const sampler = new PoissonSampler(seed);
	return {
		dimension: state.dimension,
		tables: bases.map((t) => {
			const means = outcomeProbabilities(state, t, fourier).map((p) => p * countsPerBasis);
			const counts = new Float64Array(means.length);
			sampler.drawAll(prepareMeans(means), counts);
			return tableFrom(t, counts);
		})
	};
}

/** The long-form CSV of product.md for a dataset (one row per cell). */
export function toCountsCsv(dataset: CountsDataset, comments: string[] = []): string {
	const d = dataset.dimension;
	const lines = [...comments.map((c) => `# ${c}`), 'basis,outcome_a,outcome_b,counts'];
	for (const table of dataset.tables) {
		for (let a = 0; a < d; a++)
			for (let b = 0; b < d; b++) lines.push(`${table.basis},${a},${b},${table.counts[a * d + b]}`);
	}
	return lines.join('\n') + '\n';
}
