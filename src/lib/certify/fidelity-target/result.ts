/** Telling a stored fidelity-target result from the other kinds kept in the same column. */
import type { TargetResult } from './certify-target';

export const isTargetResult = (result: unknown): result is TargetResult =>
	typeof result === 'object' &&
	result !== null &&
	(result as { method?: unknown }).method === 'fidelity-target';
