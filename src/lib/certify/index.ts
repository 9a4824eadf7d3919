/** The certification engine: pure TypeScript, shared by the server, the browser and the CLI. */
export {
	availableBases,
	basisExists,
	basisVectors,
	DEFAULT_FOURIER,
	FOURIER_CONVENTIONS,
	fourierProblem,
	isFourierConvention,
	largestOverlapError,
	outcomeLabels,
	MAX_DIMENSION,
	MIN_DIMENSION,
	type FourierConvention
} from './bases';
export {
	certify,
	certifyInBlocks,
	DEFAULTS,
	ENGINE_VERSION,
	finishCertification,
	planCertification,
	type BlockRunner,
	type CertificationPlan,
	type CertificationResult,
	type CertifyOptions,
	type BoundRung
} from './certify';
export { BROWSER_RESAMPLES_MAX, CONFIDENCE, RESAMPLES } from './limits';
export {
	checkDeclaredFourier,
	InputError,
	MAX_COUNTS_FILE_BYTES,
	type CountsDataset,
	type CountTable
} from './counts';
export { parseCountsCsv } from './counts-csv';
export { parseCountsJson } from './counts-json';
export { parseCounts } from './parse';
export {
	expectedCounts,
	outcomeProbabilities,
	sampledCounts,
	states,
	toCountsCsv,
	type SimulatedState
} from './simulate';
export {
	METHOD_IDS,
	isMethodId,
	witnessFamilies,
	type MethodId,
	type WitnessFamily
} from './witnesses';
