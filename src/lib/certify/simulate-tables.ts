/**
 * States given directly by their exact outcome tables, for the coverage benchmark and tests
 * (docs/statistics.md): the states of simulate.ts, the separable two-basis state of issue 6,
 * and a local-hidden-state steering model that reaches β_1 = 1 + 1/√d exactly.
 */
import { basisVectors } from './bases';
import type { CountsDataset } from './counts';
import { PoissonSampler, prepareMeans } from './poisson';
import { outcomeProbabilities, type SimulatedState } from './simulate';

export interface TableState {
	label: string;
	dimension: number;
	/** Exact p_t(a, b), cell a·d + b, in basis t. */
	table(t: number): Float64Array;
	/** The Schmidt number, or an upper bound on it (then `schmidtNumberIsBound`). */
	schmidtNumber: number;
	schmidtNumberIsBound?: boolean;
	/** F = ⟨Φ_d|ρ|Φ_d⟩, where the state is a two-qudit state (not for the steering model). */
	fidelity: number | null;
}

/** A state of simulate.ts; SN from Terhal & Horodecki (isotropic) or the Schmidt rank. */
export function simulatedState(label: string, s: SimulatedState): TableState {
	const d = s.dimension;
	const norm = Math.sqrt(s.schmidtCoefficients.reduce((a, c) => a + c * c, 0));
	const sumC = s.schmidtCoefficients.reduce((a, c) => a + c / norm, 0);
	const eta = s.visibility;
	const fidelity =
		eta * ((s.coherence * sumC * sumC) / d + (1 - s.coherence) / d) + (1 - eta) / (d * d);
	const rank = s.schmidtCoefficients.filter((c) => c !== 0).length;
	const isotropic = rank === d && s.coherence === 1;
	// Isotropic: SN = ⌈dF⌉ for F > 1/d (Terhal & Horodecki, Phys. Rev. A 61, 040301(R) (2000)).
	const schmidtNumber = isotropic ? Math.max(1, Math.ceil(d * fidelity - 1e-9)) : rank;
	return {
		label,
		dimension: d,
		table: (t) => outcomeProbabilities(s, t),
		schmidtNumber,
		schmidtNumberIsBound: !isotropic && eta < 1,
		fidelity
	};
}

/**
 * (1/d) Σ_j |j_1⟩⟨j_1| ⊗ |j_1*⟩⟨j_1*|: separable, uniform in basis 0, perfectly correlated in
 * basis 1; F̃ = F = 1/d and S = 1 + 1/d, both exactly on the r = 1 rung (issue 6, §1).
 */
export function separableFourierCorrelated(d: number): TableState {
	return {
		label: `separable, basis 1 correlated, d=${d}`,
		dimension: d,
		table(t) {
			if (t > 1) throw new RangeError('this state is defined for bases 0 and 1 only');
			const p = new Float64Array(d * d);
			for (let a = 0; a < d; a++)
				for (let b = 0; b < d; b++) p[a * d + b] = t === 0 ? 1 / (d * d) : a === b ? 1 / d : 0;
			return p;
		},
		schmidtNumber: 1,
		fidelity: 1 / d
	};
}

/**
 * A local-hidden-state model for the steering test with W = β_1 = 1 + 1/√d: side A always
 * answers 0, and B holds the top eigenvector ψ of |0_s*⟩⟨0_s*| + |0_u*⟩⟨0_u*| (eigenvalue
 * 1 + 1/√d for unbiased bases). No entanglement, so the steering test must certify nothing.
 */
export function localHiddenStateAtBeta1(d: number, bases: [number, number]): TableState {
	const [s, u] = bases.map((t) => basisVectors(d, t));
	// B's vectors are conjugated (witnesses.md §1): |0*⟩ has components conj(v_0m).
	const ur = Array.from({ length: d }, (_, m) => s.re[m]);
	const ui = Array.from({ length: d }, (_, m) => -s.im[m]);
	const wr = Array.from({ length: d }, (_, m) => u.re[m]);
	const wi = Array.from({ length: d }, (_, m) => -u.im[m]);
	let cr = 0;
	let ci = 0; // c = ⟨u|w⟩
	for (let m = 0; m < d; m++) {
		cr += ur[m] * wr[m] + ui[m] * wi[m];
		ci += ur[m] * wi[m] - ui[m] * wr[m];
	}
	const abs = Math.hypot(cr, ci);
	const [er, ei] = [cr / abs, -ci / abs]; // e^{iθ} = conj(c)/|c| makes ⟨u|e^{iθ}w⟩ = |c|
	const psiR = ur.map((x, m) => x + er * wr[m] - ei * wi[m]);
	const psiI = ui.map((x, m) => x + er * wi[m] + ei * wr[m]);
	const n = Math.sqrt(psiR.reduce((a, x, m) => a + x * x + psiI[m] * psiI[m], 0));
	return {
		label: `local hidden states at β1, d=${d}`,
		dimension: d,
		table(t) {
			const { re, im } = basisVectors(d, t);
			const p = new Float64Array(d * d);
			for (let b = 0; b < d; b++) {
				// ⟨b_t*|ψ⟩ = Σ_m v_bm ψ_m
				let ar = 0;
				let ai = 0;
				for (let m = 0; m < d; m++) {
					ar += re[b * d + m] * psiR[m] - im[b * d + m] * psiI[m];
					ai += re[b * d + m] * psiI[m] + im[b * d + m] * psiR[m];
				}
				p[b] = (ar * ar + ai * ai) / (n * n);
			}
			return p;
		},
		schmidtNumber: 1,
		fidelity: null
	};
}

/** Poisson counts with means p·countsPerBasis, tables in the order given, from a seed. */
export function sampleTables(
	state: TableState,
	bases: number[],
	countsPerBasis: number,
	seed: number
): CountsDataset {
	const sampler = new PoissonSampler(seed);
	const cells = state.dimension * state.dimension;
	return {
		dimension: state.dimension,
		tables: bases.map((basis) => {
			const counts = new Float64Array(cells);
			sampler.drawAll(prepareMeans(state.table(basis).map((p) => p * countsPerBasis)), counts);
			return {
				basis,
				counts,
				accidentals: null,
				durations: null,
				present: new Uint8Array(cells).fill(1)
			};
		})
	};
}

/**
 * Structured cross-talk (issue 19, part 2): ρ = v·Φ_d + (1 − v)·σ, σ = (1/K) Σ_{m<K} |m⟩⟨m| ⊗
 * |m+1⟩⟨m+1| (mod d): K modes leak into their neighbour. In basis 0 the leak sits in K cells next to
 * the diagonal; in every MUB t ≥ 1 it is flat, 1/d². F = v (σ has no weight on |mm⟩), and
 * F̃ = v − (K − 1)(1 − v)/d: for K = 1 the witness is exact, while the floor P₀ + P₁ − 1 is only
 * 2v − 1 + (1 − v)/d. SN ≥ ⌈d·v⌉ (Terhal & Horodecki); recorded as the bound d.
 */
export function crossTalk(d: number, v: number, leaking = 1): TableState {
	return {
		label: `cross-talk v=${v}, ${leaking} leaking mode${leaking === 1 ? '' : 's'}, d=${d}`,
		dimension: d,
		table(t) {
			const p = new Float64Array(d * d).fill(t === 0 ? 0 : (1 - v) / (d * d));
			for (let a = 0; a < d; a++) p[a * d + a] += v / d;
			if (t === 0) for (let m = 0; m < leaking; m++) p[m * d + ((m + 1) % d)] += (1 - v) / leaking;
			return p;
		},
		schmidtNumber: d,
		schmidtNumberIsBound: true,
		fidelity: v
	};
}
