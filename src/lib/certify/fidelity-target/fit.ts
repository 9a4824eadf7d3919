/**
 * λ fitted on a separate calibration run (witnesses.md §4.3′, §9): λ_m² is the run's share of the
 * matching pairs |mm⟩ in its computational table (basis 0), λ_m = √(N_mm / Σ_k N_kk), then frozen.
 * Any λ fixed independently of the certified counts keeps the bound's level (the fit only moves its
 * power), so fitting on the counts being certified is refused: their SHA-256 or their table may
 * not equal the run's.
 */
import { InputError, type CountsDataset } from '../counts';

export interface TargetFit {
	/** λ with Σλ² = 1, in mode order (must not increase: the tilted vectors are built on it). */
	coefficients: number[];
	/** The run's matching counts N_mm the fit used. */
	diagonal: number[];
	/** SHA-256 of the calibration run's file as given. */
	runSha256: string;
	method: 'diagonal-share';
}

function computationalTable(run: CountsDataset, what: string) {
	const table = run.tables.find((t) => t.basis === 0);
	if (!table)
		throw new InputError(`${what}: the calibration run has no computational table (basis 0)`);
	return table.counts;
}

export function fitTarget(run: CountsDataset, runSha256: string): TargetFit {
	const d = run.dimension;
	const counts = computationalTable(run, 'fit');
	const diagonal = Array.from({ length: d }, (_, m) => counts[m * d + m]);
	const total = diagonal.reduce((s, x) => s + x, 0);
	diagonal.forEach((n, m) => {
		if (!(n > 0))
			throw new InputError(
				`calibration run: no matching pairs in mode ${m} (cell ${m},${m}); λ_${m} cannot be fitted`
			);
		if (m > 0 && n > diagonal[m - 1])
			throw new InputError(
				`calibration run: matching pairs increase from mode ${m - 1} (${diagonal[m - 1]}) to mode ${m} (${n}); λ must not increase, so order the modes by weight`
			);
	});
	return {
		coefficients: diagonal.map((n) => Math.sqrt(n / total)),
		diagonal,
		runSha256,
		method: 'diagonal-share'
	};
}

/** Refuses a "calibration run" that is the certified counts themselves (same bytes or same table). */
export function requireSeparateRun(
	run: CountsDataset,
	runSha256: string,
	certified: CountsDataset,
	certifiedSha256: string
): void {
	const same =
		runSha256 === certifiedSha256 ||
		(run.dimension === certified.dimension &&
			computationalTable(run, 'fit').every(
				(x, i) => x === computationalTable(certified, 'counts')[i]
			));
	if (same)
		throw new InputError(
			'calibration run: it holds the very counts being certified; λ fitted on them would be chosen after seeing the data (witnesses.md §9). Give a separate run.'
		);
}
