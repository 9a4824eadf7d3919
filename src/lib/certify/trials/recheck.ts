/**
 * What an offline verifier does with a time-ordered certificate: re-read the trials (plain or
 * gzip-compressed), re-run the check with the options the result records, and compare every
 * p-value bit for bit (the check draws no random numbers, so any difference means other data,
 * other options or another engine). Node only (zlib): import this file directly.
 */
import type { FourierConvention } from '../bases';
import { certifyTrials, type TrialsResult } from './certify-trials';
import { plainTrialsBytes } from './inflate';
import { parseTrials } from './parse';

export interface TrialsRecheck {
	matches: boolean;
	/** One line per number that differs, naming it. */
	differences: string[];
}

/** Fields compared exactly, by name, between the recorded result and the recomputed one. */
function compare(recorded: TrialsResult, again: TrialsResult): string[] {
	const out: string[] = [];
	const same = (what: string, a: unknown, b: unknown) => {
		if (!Object.is(a, b)) out.push(`${what}: recorded ${String(a)}, recomputed ${String(b)}`);
	};
	same('trials', recorded.trials, again.trials);
	same('blocks', recorded.blocks, again.blocks);
	same('rungs', recorded.rungs.length, again.rungs.length);
	recorded.rungs.forEach((rung, i) => {
		same(`rung ${rung.rung} log10 p`, rung.log10P, again.rungs[i]?.log10P);
		same(`rung ${rung.rung} log10 M_N`, rung.log10Final, again.rungs[i]?.log10Final);
	});
	same('settings check', recorded.settings.passed, again.settings.passed);
	same('certified Schmidt number', recorded.certifiedSchmidtNumber, again.certifiedSchmidtNumber);
	return out;
}

/** The check run again on the file's bytes with the settings the recorded result names. */
export function rerunTrials(
	bytes: Uint8Array,
	recorded: TrialsResult,
	fourier?: FourierConvention
): TrialsResult {
	const data = parseTrials(plainTrialsBytes(bytes), recorded.dimension, recorded.mode);
	return certifyTrials(data, {
		method: recorded.method,
		bases: recorded.bases,
		probabilities: recorded.probabilities,
		fourier,
		confidence: recorded.confidence,
		inputSha256: recorded.inputSha256 ?? undefined
	});
}

export function recheckTrials(
	bytes: Uint8Array,
	recorded: TrialsResult,
	fourier?: FourierConvention
): TrialsRecheck {
	const differences = compare(recorded, rerunTrials(bytes, recorded, fourier));
	return { matches: differences.length === 0, differences };
}
