/**
 * The landing page's live example: an invented source, simulated with the engine's own
 * simulator so that visitors can watch a check run in their browser. No real group or data.
 */
import {
	certify,
	sampledCounts,
	states,
	toCountsCsv,
	type CountsDataset,
	type MethodId
} from '$lib/certify';

export const halvorsenLake = {
	group: 'Halvorsen Lake photonics group',
	source: 'time-bin entangled photon pairs',
	dimension: 7,
	visibility: 0.92,
	pairsPerBasis: 200_000,
	/** Computational, Fourier and the first quadratic-phase basis (witnesses.md §2). */
	bases: [0, 1, 2],
	claimedSchmidtNumber: 6,
	/** Fixes the simulated counts; the bootstrap seed chosen on the page is separate. */
	dataSeed: 20_250_611
} as const;

let drawn: CountsDataset | null = null;

/** Poisson-sampled counts of a white-noise isotropic state; fixed by the data seed, so drawn once. */
export function halvorsenLakeCounts(): CountsDataset {
	const s = halvorsenLake;
	drawn ??= sampledCounts(
		states.isotropic(s.dimension, s.visibility),
		[...s.bases],
		s.pairsPerBasis,
		s.dataSeed
	);
	return drawn;
}

/** The same counts as our long-form CSV, labelled as simulated in its comment lines. */
export function halvorsenLakeCsv(): string {
	const s = halvorsenLake;
	return toCountsCsv(halvorsenLakeCounts(), [
		`SIMULATED data: the ${s.group} is fictional.`,
		`Isotropic state, d = ${s.dimension}, visibility ${s.visibility}, ${s.pairsPerBasis} pairs per basis.`,
		`Simulator seed ${s.dataSeed} (Rankseal engine, sampledCounts).`
	]);
}

/** Runs the engine on the demo counts against the group's claim, timed in this runtime. */
export function checkHalvorsenLake(options: { method: MethodId; resamples: number; seed: number }) {
	const counts = halvorsenLakeCounts();
	const started = performance.now();
	const result = certify(counts, { ...options, claim: halvorsenLake.claimedSchmidtNumber });
	return { result, elapsedMs: performance.now() - started };
}
