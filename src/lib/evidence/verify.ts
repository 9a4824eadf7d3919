/**
 * Checks an evidence bundle offline: every hash, both signatures, the signing key, the canonical
 * counts, then re-runs the engine with the recorded settings and compares every number. Stops at
 * the first item that fails and names it. Shared by the bundled verify.mjs, the verify command
 * and the server. The checks live one part a file (verify-signatures, verify-counts, verify-rerun,
 * verify-trials); this file runs them in order and writes the report.
 */
import { ENGINE_VERSION } from '../certify';
import type { LedgerCheckpoint } from './checkpoint';
import type { EvidenceFiles } from './layout';
import { checkAnalyses, checkCounts } from './verify-counts';
import { checkRerun } from './verify-rerun';
import { checkCheckpoint, checkContents, checkManifest, checkStatement } from './verify-signatures';
import { Failure, type State, type VerifyOptions } from './verify-state';
import { TrialsFailure } from './verify-trials';
import { TargetFailure } from './verify-target';

export type { VerifyOptions } from './verify-state';

export interface VerificationReport {
	valid: boolean;
	/** The first item that failed, e.g. `signature.txt` or `re-run: statistic.lower`. */
	failedItem: string | null;
	message: string;
	certificateId: string | null;
	fingerprint: string | null;
	keyId: string | null;
	/**
	 * True when the signing key was found on a list the caller gave (a saved copy of the service's
	 * list, a pinned fingerprint, or the service's own keys); false when only the bundle's own
	 * signing-keys.json vouches for it, which anyone who re-signs a bundle can write.
	 */
	anchored: boolean;
	/** The ledger checkpoint the bundle carries, signed by its key; null in older bundles. */
	checkpoint: LedgerCheckpoint | null;
	/** The items that passed, in the order checked. */
	passed: string[];
	/**
	 * The engine version the bundle was made with when this verifier has another: everything but
	 * the re-run was checked, and the bundle's own verify.mjs (that engine) can re-run it.
	 */
	otherEngine: string | null;
}

export function verifyEvidence(
	files: EvidenceFiles,
	options: VerifyOptions = {}
): VerificationReport {
	const s: State = { files, options, passed: [] };
	const report = (failedItem: string | null, message: string): VerificationReport => ({
		valid: failedItem === null,
		failedItem,
		message,
		certificateId: s.manifest?.certificateId ?? s.contents?.certificateId ?? null,
		fingerprint: s.fingerprint ?? s.contents?.fingerprint ?? null,
		keyId: s.keyId ?? null,
		anchored: options.trustedKeyIds !== undefined,
		checkpoint: s.checkpoint ?? null,
		passed: s.passed,
		otherEngine: s.otherEngine ?? null
	});
	try {
		checkContents(s);
		checkManifest(s);
		checkCheckpoint(s);
		checkCounts(s);
		checkAnalyses(s);
		checkRerun(s);
		checkStatement(s);
	} catch (error) {
		if (
			error instanceof Failure ||
			error instanceof TrialsFailure ||
			error instanceof TargetFailure
		)
			return report(error.item, error.message);
		return report('bundle', `cannot be checked: ${(error as Error).message}`);
	}
	if (s.otherEngine)
		return report(
			null,
			`every hash and both signatures agree, but the computation was not re-run: the bundle was made by engine ${s.otherEngine} and this verifier has engine ${ENGINE_VERSION}; the bundle's own verify.mjs, which has engine ${s.otherEngine}, re-runs it`
		);
	return report(null, 'every hash, both signatures and the re-run agree');
}
