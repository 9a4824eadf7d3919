/**
 * A product state |ψ⟩|ψ*⟩ measured in calibrated bases, as exact tables for the coverage benchmark
 * (docs/statistics.md §9): p_t(a, b) = |⟨a_t|ψ⟩|²·|⟨b_t*|ψ*⟩|² = |⟨a_t|ψ⟩|²·|⟨b_t|ψ⟩|².
 */
import type { TableState } from '../simulate-tables';
import type { Calibration } from './calibration-file';

export function calibratedProductState(
	label: string,
	calibration: Calibration,
	psi: [number, number][]
): TableState {
	const d = calibration.dimension;
	const norm = psi.reduce((s, [re, im]) => s + re * re + im * im, 0);
	return {
		label,
		dimension: d,
		table(t) {
			const basis = calibration.bases.find((b) => b.basis === t);
			if (!basis) throw new RangeError(`basis ${t} is not calibrated`);
			const q = Array.from({ length: d }, (_, a) => {
				let [re, im] = [0, 0];
				for (let m = 0; m < d; m++) {
					const [vr, vi] = [basis.re[a * d + m], basis.im[a * d + m]];
					re += vr * psi[m][0] + vi * psi[m][1];
					im += vr * psi[m][1] - vi * psi[m][0];
				}
				return (re * re + im * im) / norm;
			});
			const p = new Float64Array(d * d);
			for (let a = 0; a < d; a++) for (let b = 0; b < d; b++) p[a * d + b] = q[a] * q[b];
			return p;
		},
		schmidtNumber: 1,
		fidelity: null
	};
}
