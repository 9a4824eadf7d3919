/** Checks that draw no random numbers: any seed re-runs them to the bit, or they differ in data. */
import { isTargetResult } from './fidelity-target/result';
import { isTrialsResult } from './trials/certify-trials';

/** Time-ordered trials (a test supermartingale) and fidelity-target (exact limits, no resampling). */
export const seedless = (result: unknown): boolean =>
	isTrialsResult(result) || isTargetResult(result);
