/**
 * The landing page's live example: an invented source, simulated with the engine's own
 * simulator so that visitors can watch a check run in their browser. No real group or data.
 */
import { sampledCounts, states, toCountsCsv, type CountsDataset } from '$lib/certify';

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

/** Poisson-sampled counts of a white-noise isotropic state with the scenario's visibility. */
export function halvorsenLakeCounts(): CountsDataset {
	const s = halvorsenLake;
	return sampledCounts(
		states.isotropic(s.dimension, s.visibility),
		[...s.bases],
		s.pairsPerBasis,
		s.dataSeed
	);
}

/** The same counts as our long-form CSV, labelled as simulated in its comment lines. */
export function halvorsenLakeCsv(dataset: CountsDataset): string {
	const s = halvorsenLake;
	return toCountsCsv(dataset, [
		`SIMULATED data: the ${s.group} is fictional.`,
		`Isotropic state, d = ${s.dimension}, visibility ${s.visibility}, ${s.pairsPerBasis} pairs per basis.`,
		`Simulator seed ${s.dataSeed} (Rankseal engine, sampledCounts).`
	]);
}
