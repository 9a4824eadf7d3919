/**
 * The certificate kind from time-ordered trials (witnesses.md §10) in the signed manifest: the
 * result is the supermartingale check's (mode, setting probabilities, p_r per rung, betting rule,
 * settings check), and the `trials` block adds the kind, the assumption in words and the file.
 */
import type { TrialsData, TrialsMode, TrialsResult } from '../certify/trials';
import { iidDataset } from '../certify/trials/settings-plan';
import { canonicalCountsText, type EvidenceManifest, type EvidenceTrials } from './manifest';

export const TRIALS_KIND = 'time-ordered-trials' as const;

/** What a time-ordered certificate holds true under, in words (PDF, /seal, manifest). */
export function trialsAssumption(mode: TrialsMode): string {
	const fair = 'Detected pairs are a fair sample of the emitted ones.';
	return mode === 'blocks'
		? `Valid without the i.i.d. assumption, assuming that the setting of each block of time is chosen at random with the declared probabilities, independently of the source and of the past, and that the source receives nothing from the detectors during a block. ${fair}`
		: `Valid without the i.i.d. assumption, assuming that the setting of each trial is chosen at random with the declared probabilities, independently of the source and of the past. ${fair}`;
}

export type { EvidenceTrials } from './manifest';

/** A manifest of the time-ordered kind: `counts` names the trials file, `result` is the check's. */
export type TrialsManifest = Omit<EvidenceManifest, 'result' | 'trials'> & {
	result: TrialsResult;
	trials: EvidenceTrials;
};

export const trialsUploadedName = (gzip: boolean) =>
	gzip ? 'trials-uploaded.csv.gz' : 'trials-uploaded.csv';

export const isTrialsManifest = (manifest: object): manifest is TrialsManifest =>
	(manifest as { trials?: { kind?: unknown } }).trials?.kind === TRIALS_KIND;

export function evidenceTrials(mode: TrialsMode, gzip: boolean): EvidenceTrials {
	const uploadedName = trialsUploadedName(gzip);
	return { kind: TRIALS_KIND, mode, assumption: trialsAssumption(mode), uploadedName, gzip };
}

/** The trials summed, in the canonical counts form: the bundle's counts-canonical.json. */
export const trialsCountsText = (data: TrialsData, bases: number[]): string =>
	canonicalCountsText(iidDataset(data, bases));

/** The certificate's kind as views and pages show it, with its assumption in words (or null). */
export function certificateKind(manifest: object) {
	if (!isTrialsManifest(manifest)) return { kind: 'counts' as const, assumption: null };
	return { kind: TRIALS_KIND, assumption: manifest.trials.assumption };
}

/** A time-ordered certificate judges the claim by its certified number (the result has no verdict). */
export const trialsVerdict = (m: TrialsManifest): 'supported' | 'not supported' =>
	m.result.certifiedSchmidtNumber >= m.claim.claimedSchmidtNumber ? 'supported' : 'not supported';
