/**
 * Expected counts for witnesses.md §4.3′'s isotropic example (d = 3, λ ∝ (.863, .485, .143),
 * v = 0.9: F̃ = 0.8893355): basis 0 the computational table, basis 1 the tilted-vector table, both
 * per `pairs` computational pairs at the same integration time.
 */
export const TARGET_EXAMPLE = { d: 3, raw: [0.863, 0.485, 0.143], v: 0.9, value: 0.8893355 };

/** |⟨ṽ_a ⊗ ṽ_b*|Φ_λ⟩|² = |Σ_m λ_m² ω^{(b−a)m}|² / (Σλ)² (λ scaled to Σλ² = 1). */
function tiltedPure(lambda: number[], a: number, b: number): number {
	const d = lambda.length;
	const s = lambda.reduce((p, x) => p + x, 0);
	let [re, im] = [0, 0];
	for (let m = 0; m < d; m++) {
		const angle = (2 * Math.PI * (b - a) * m) / d;
		re += ((lambda[m] * lambda[m]) / s) * Math.cos(angle);
		im += ((lambda[m] * lambda[m]) / s) * Math.sin(angle);
	}
	return re * re + im * im;
}

/** The CSV of v·Φ_λ + (1 − v)·𝟙/d² at `pairs` computational pairs (rounded expected counts). */
export function targetCountsCsv(raw: number[], v: number, pairs: number): string {
	const d = raw.length;
	const norm = Math.hypot(...raw);
	const lambda = raw.map((x) => x / norm);
	const rows = ['basis,outcome_a,outcome_b,counts'];
	for (let a = 0; a < d; a++)
		for (let b = 0; b < d; b++) {
			const p = (a === b ? v * lambda[a] * lambda[a] : 0) + (1 - v) / (d * d);
			rows.push(`0,${a},${b},${Math.round(pairs * p)}`);
		}
	for (let a = 0; a < d; a++)
		for (let b = 0; b < d; b++) {
			const p = v * tiltedPure(lambda, a, b) + (1 - v) / (d * d);
			rows.push(`1,${a},${b},${Math.round(pairs * p)}`);
		}
	return rows.join('\n') + '\n';
}
