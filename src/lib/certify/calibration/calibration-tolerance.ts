/**
 * How far from unbiased the real bases may be before a correlation-sum certificate fails
 * (witnesses.md §4.4): if every d·|⟨a_t|b_s⟩|² lies in 1 ± δ then μ ≤ 1 + (m − 1)·δ, and the rung
 * the certificate passed, B_{k−1}(μ) = μ + (m − μ)(k − 1)/d, still lies below the lower bound L while
 * δ < (L − B_{k−1}(1)) / ((m − 1)(1 − (k − 1)/d)).
 */
import type { MethodId } from '../witnesses';

export interface CalibrationTolerance {
	/** The largest such δ (a supremum: at δ itself the bound is met, not exceeded); null when not computed. */
	value: number | null;
	/** The same in a sentence a physicist reads at once. */
	note: string;
}

export function percent(x: number): string {
	const p = 100 * x;
	return `${p >= 10 ? p.toFixed(1) : p >= 0.1 ? p.toFixed(2) : p.toPrecision(2)} %`;
}

export interface ToleranceInputs {
	method: MethodId;
	lower: number;
	certified: number;
	m: number;
	d: number;
	/** The check used a calibration: its ladder already holds for the measured bases. */
	calibrated: boolean;
}

/** null for methods that are not correlation sums. */
export function calibrationTolerance(o: ToleranceInputs): CalibrationTolerance | null {
	if (o.method === 'steering-2mub')
		return {
			value: null,
			note: 'Side B’s tolerance is not computed: the steering bound needs side B’s bases exactly unbiased, and no proven form of it for measured overlaps exists yet (witnesses.md §4.2 addendum).'
		};
	if (o.method !== 'mub-correlation') return null;
	if (o.calibrated)
		return {
			value: null,
			note: 'Calibrated bases: the ladder already uses the measured overlaps and their stated error.'
		};
	const k = o.certified;
	if (k < 2)
		return { value: null, note: 'Nothing is certified, so there is no tolerance to state.' };
	const rung = 1 + ((o.m - 1) * (k - 1)) / o.d;
	const value = (o.lower - rung) / ((o.m - 1) * (1 - (k - 1) / o.d));
	return {
		value,
		note: `Schmidt number ≥ ${k} holds for bases unbiased to within ${percent(value)} (every d·|⟨a_t|b_s⟩|² within 1 ± ${value.toPrecision(2)}).`
	};
}
