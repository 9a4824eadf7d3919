/**
 * Analyses of one counts file: what makes two of them distinct, the seed a check gets when none
 * is chosen, and the level a certificate is stated at once several were tried (Bonferroni).
 * Pure: the server, the manifest and the offline verifier use the very same rules.
 */
import type { FourierConvention } from '../certify';
import { canonicalJson } from './canonical';
import { sha256Hex } from './hash';

/** The settings that change a check's numbers; the counts themselves are fixed by their SHA-256. */
export interface AnalysisSettings {
	method: string;
	/** In the order given: fidelity-two-basis reads its first basis differently from its second. */
	bases: number[];
	fourier: FourierConvention;
	confidence: number;
	resamples: number;
	subtractAccidentals: boolean;
	/** fidelity-target: the target λ (Σλ² = 1); another λ on the same counts is another analysis (§9). */
	target?: number[];
}

/** One distinct analysis as a certificate lists it: `seed` is 'derived' or the chosen number. */
export interface AnalysisEntry extends AnalysisSettings {
	seed: number | 'derived';
	/** When it was first run (ISO 8601). */
	firstRunAt: string;
}

/** What a certificate says of the analyses of its counts (manifest field `analyses`). */
export interface EvidenceAnalyses {
	/** Distinct analyses of these counts in the group up to this certificate, this one included. */
	total: number;
	/** The certified analysis is the claim's declared one (method, bases, convention, confidence). */
	declared: boolean;
	/** The confidence the check ran at; `parameters.confidence` is the corrected level. */
	nominalConfidence: number;
	list: AnalysisEntry[];
}

const settingsOf = (s: AnalysisSettings): AnalysisSettings => ({
	method: s.method,
	bases: [...s.bases],
	fourier: s.fourier,
	confidence: s.confidence,
	resamples: s.resamples,
	subtractAccidentals: s.subtractAccidentals,
	// Present only for fidelity-target, so that every other analysis keeps its key and derived seed.
	...(s.target ? { target: [...s.target] } : {})
});

/** Seeds run 1..2³²−1 (the engine's range). */
const SEED_RANGE = 4294967295;

/**
 * The seed a check gets when none is chosen: from the canonical counts' SHA-256 and the settings,
 * so the same analysis always gives the same numbers and trying seeds needs an explicit choice.
 */
export function derivedSeed(countsSha256: string, settings: AnalysisSettings): number {
	const digest = sha256Hex(canonicalJson({ counts: countsSha256, ...settingsOf(settings) }));
	return 1 + (parseInt(digest.slice(0, 8), 16) % SEED_RANGE);
}

/** The seed as an analysis counts it: a seed equal to the derived one is no new analysis. */
export function seedChoice(
	countsSha256: string,
	settings: AnalysisSettings,
	seed: number
): number | 'derived' {
	return seed === derivedSeed(countsSha256, settings) ? 'derived' : seed;
}

/** Two analyses are the same exactly when their keys are equal (same settings, same seed choice). */
export function analysisKey(settings: AnalysisSettings, seed: number | 'derived'): string {
	return canonicalJson({ ...settingsOf(settings), seed });
}

/** Full confidence only for the declared analysis when nothing else was tried on the counts. */
export const isExploratory = (a: Pick<EvidenceAnalyses, 'total' | 'declared'>): boolean =>
	!(a.declared && a.total === 1);

/** The level a certificate is stated at: error α/n for an exploratory one (Bonferroni). */
export function correctedConfidence(a: Omit<EvidenceAnalyses, 'list'>): number {
	if (!isExploratory(a)) return a.nominalConfidence;
	return 1 - (1 - a.nominalConfidence) / a.total;
}

/** Why a manifest's analyses block does not hold together; null when it does. */
export function analysesProblem(a: EvidenceAnalyses, statedConfidence: number): string | null {
	if (!Number.isInteger(a.total) || a.total < 1) return 'total must be a whole number ≥ 1';
	if (!Array.isArray(a.list) || a.list.length !== a.total)
		return `it lists ${a.list?.length ?? 0} analyses but says ${a.total}`;
	const expected = correctedConfidence(a);
	if (statedConfidence !== expected)
		return `the stated confidence ${statedConfidence} is not the corrected level ${expected} for ${a.total} analyses`;
	return null;
}
