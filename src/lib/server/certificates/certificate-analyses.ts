/**
 * What a certificate states once the analyses of its counts are counted (issue 15): the declared
 * analysis alone keeps the check's confidence; anything else is exploratory and is re-computed at
 * the Bonferroni-corrected level, with the check's own seed and resamples.
 */
import { certify, parseCounts, type CertificationResult } from '$lib/certify';
import { isTargetResult } from '$lib/certify/fidelity-target';
import { certifyClaimTarget } from '$lib/certify/fidelity-target/fitted';
import type { CertifiedResult } from '$lib/evidence/manifest';
import { targetPart } from '../checks/target-task';
import { correctedConfidence, isExploratory, type EvidenceAnalyses } from '$lib/evidence/analyses';
import { jsonRoundTrip } from '$lib/evidence/canonical';
import { firstDifference } from '$lib/evidence/compare';
import type { Database } from '../db';
import type { CheckAttributes } from '../db/models/Check';
import type { ClaimAttributes } from '../db/models/Claim';
import type { DatasetAttributes } from '../db/models/Dataset';
import { analysesForCertificate } from '../checks/analyses';
import { ConflictError } from '../core/errors';

export interface StatedResult {
	analyses: EvidenceAnalyses;
	/** The level the certificate states: the check's, or the corrected one. */
	confidence: number;
	result: CertifiedResult;
}

/** The check's result re-computed at another confidence (same seed, resamples and subtraction). */
export function resultAtLevel(
	uploaded: Uint8Array,
	claim: Pick<
		ClaimAttributes,
		| 'dimension'
		| 'claimedSchmidtNumber'
		| 'target'
		| 'targetDeclared'
		| 'targetRun'
		| 'targetRunSha256'
	>,
	check: CheckAttributes,
	confidence: number,
	inputSha256: string
): CertifiedResult {
	const recorded = check.result! as CertifiedResult;
	const target = targetPart(claim);
	if (isTargetResult(recorded) && target)
		return certifyClaimTarget(parseCounts(uploaded, claim.dimension), target, {
			confidence,
			claim: recorded.claim?.schmidtNumber ?? claim.claimedSchmidtNumber,
			inputSha256
		});
	const witness = recorded as CertificationResult;
	return certify(parseCounts(uploaded, claim.dimension), {
		method: witness.method,
		bases: witness.bases,
		fourier: witness.fourier,
		resamples: check.resamples,
		confidence,
		seed: Number(check.seed),
		subtractAccidentals: witness.backgroundSubtracted,
		claim: witness.claim?.schmidtNumber ?? claim.claimedSchmidtNumber,
		inputSha256
	});
}

export async function statedResult(
	database: Database,
	claim: ClaimAttributes,
	source: { check: CheckAttributes; dataset: DatasetAttributes; uploaded: Uint8Array }
): Promise<StatedResult> {
	const { check, dataset, uploaded } = source;
	const analyses = await analysesForCertificate(database, claim, check, dataset);
	const confidence = correctedConfidence(analyses);
	if (!isExploratory(analyses)) return { analyses, confidence, result: check.result! };
	const atLevel = (level: number) =>
		jsonRoundTrip(resultAtLevel(uploaded, claim, check, level, dataset.sha256));
	let result: CertifiedResult;
	try {
		// The check's own record must still re-run, as the bundle's verifier demands of a declared one.
		const differs = firstDifference(check.result, atLevel(check.confidence));
		if (differs)
			throw new ConflictError(
				`This check cannot be certified (re-run: ${differs}: the stored result differs from a re-run); run the check again`
			);
		result = atLevel(confidence);
	} catch (error) {
		if (error instanceof ConflictError) throw error;
		throw new ConflictError(
			`This analysis is one of ${analyses.total} of these counts, so it is certified at confidence ${confidence}, and the engine refused that level: ${(error as Error).message}`
		);
	}
	return { analyses, confidence, result };
}
