/**
 * The correlation-sum ladder in calibrated bases (witnesses.md §4.4): SN ≤ r ⇒ S ≤ μ⁺ + (m − μ⁺)·r/d,
 * μ the largest eigenvalue of the md × md Gram matrix G (G_tt = I − J/d, G_ts = D^{ts} − J/d) and
 * μ⁺ = μ + (m − 1)·d·ε for an entrywise error ε on the overlaps, capped at m (μ = ‖Σ_t Q_t‖ ≤ m).
 */
import { InputError } from '../counts';
import { MAX_CALIBRATED_SIZE, type Calibration, type CalibratedBasis } from './calibration-file';
import { largestEigenvalueUpper, type EigenvalueBound } from './largest-eigenvalue';
import { checkOrthonormal, largestBias, overlapMatrix } from './overlaps';

const UNIT_ROUNDOFF = 2 ** -53;

export interface CalibratedMu {
	/** Power-iteration estimate of μ. */
	mu: number;
	/** Guaranteed upper bound on μ of the calibrated vectors (rounding included). */
	muUpper: number;
	/** min(muUpper + (m − 1)·d·ε, m): what the ladder uses. */
	muPlus: number;
	eigenvalueMethod: EigenvalueBound['method'];
	/** max |d·|⟨a_t|b_s⟩|² − 1| over the bases used. */
	largestBias: number;
}

export function gramMatrix(bases: CalibratedBasis[], d: number): Float64Array {
	const n = bases.length * d;
	const g = new Float64Array(n * n);
	bases.forEach((s, i) =>
		bases.forEach((t, k) => {
			const overlap = i === k ? null : overlapMatrix(s, t, d);
			for (let a = 0; a < d; a++)
				for (let b = 0; b < d; b++) {
					const value = overlap ? overlap[a * d + b] : a === b ? 1 : 0;
					g[(i * d + a) * n + k * d + b] = value - 1 / d;
				}
		})
	);
	return g;
}

/** The calibrated bases in the order of `bases`; refuses missing or non-orthonormal ones. */
export function basesUsed(calibration: Calibration, bases: number[]): CalibratedBasis[] {
	const d = calibration.dimension;
	if (bases.length * d > MAX_CALIBRATED_SIZE)
		throw new InputError(
			`calibration: m·d = ${bases.length * d} is above the supported ${MAX_CALIBRATED_SIZE}`
		);
	return bases.map((t) => {
		const found = calibration.bases.find((b) => b.basis === t);
		if (!found)
			throw new InputError(`calibration: basis ${t} is used by the check but not calibrated`);
		checkOrthonormal(found, d, calibration.tolerance);
		return found;
	});
}

export function calibratedMu(calibration: Calibration, bases: number[]): CalibratedMu {
	const d = calibration.dimension;
	const used = basesUsed(calibration, bases);
	const m = used.length;
	const n = m * d;
	const bound = largestEigenvalueUpper(gramMatrix(used, d), n);
	// Each entry of G carries a rounding error below (2d + 6)·u (a sum of d products, squared).
	const roundingOfG = n * (2 * d + 6) * UNIT_ROUNDOFF;
	const muUpper = bound.upper + roundingOfG;
	return {
		mu: bound.estimate,
		muUpper,
		muPlus: Math.min(muUpper + (m - 1) * d * calibration.tolerance, m),
		eigenvalueMethod: bound.method,
		largestBias: largestBias(used, d)
	};
}

/** B_r = μ⁺ + (m − μ⁺)·r/d for r = 1 … d − 1; μ⁺ = 1 gives §4.1's 1 + (m − 1)·r/d. */
export function calibratedBounds(muPlus: number, m: number, d: number): number[] {
	return Array.from({ length: d - 1 }, (_, i) => muPlus + ((m - muPlus) * (i + 1)) / d);
}
