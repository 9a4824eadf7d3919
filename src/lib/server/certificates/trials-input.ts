/**
 * What a certificate from time-ordered trials records (issue 20): the check's supermartingale
 * result at the level the certificate states (corrected when the analyses of the file are
 * exploratory, as for counts), the file as uploaded, and the kind and its assumption in words.
 */
import { DEFAULTS } from '$lib/certify';
import type { TrialsResult } from '$lib/certify/trials';
import { isGzip } from '$lib/certify/trials/inflate';
import { correctedConfidence, isExploratory } from '$lib/evidence/analyses';
import { jsonRoundTrip } from '$lib/evidence/canonical';
import { firstDifference } from '$lib/evidence/compare';
import { evidenceTrials } from '$lib/evidence/trials-evidence';
import type { EngineTasks } from '../checks/engine-tasks';
import type { Database } from '../db';
import type { CheckAttributes } from '../db/models/Check';
import type { ClaimAttributes } from '../db/models/Claim';
import type { DatasetAttributes } from '../db/models/Dataset';
import type { EvidenceInput } from '../evidence/artifacts';
import { analysesForCertificate } from '../checks/analyses';
import { ConflictError } from '../core/errors';

export interface TrialsSource {
	check: CheckAttributes;
	dataset: DatasetAttributes;
	uploaded: Uint8Array;
}

/** The Fourier convention the check ran with: its i.i.d. comparison's, else the claim's. */
const fourierOf = (result: TrialsResult, claim: ClaimAttributes) =>
	'error' in result.iid ? claim.fourier : result.iid.fourier;

/** The recorded result re-run on the worker at `level`, with the summed counts' text. */
async function rerunAt(
	runner: EngineTasks,
	claim: ClaimAttributes,
	source: TrialsSource,
	level: number
) {
	const recorded = source.check.result as unknown as TrialsResult;
	const task = {
		bytes: source.uploaded,
		dimension: recorded.dimension,
		mode: recorded.mode,
		method: recorded.method,
		bases: recorded.bases,
		probabilities: recorded.probabilities,
		fourier: fourierOf(recorded, claim),
		confidence: level,
		inputSha256: source.dataset.sha256
	};
	try {
		return await runner.trialsEvidence(task, `issue:${claim.groupId}`);
	} catch (error) {
		// As for counts (certificate-analyses.ts): a refusal by the engine is the check's, not a fault.
		throw new ConflictError(
			`This check cannot be certified at confidence ${level}: the engine refused it (${(error as Error).message})`
		);
	}
}

/** The result the certificate states; a check whose record no longer re-runs is refused. */
async function statedTrials(
	database: Database,
	runner: EngineTasks,
	claim: ClaimAttributes,
	source: TrialsSource
) {
	const { check, dataset } = source;
	const analyses = await analysesForCertificate(database, claim, check, dataset);
	const confidence = correctedConfidence(analyses);
	const own = await rerunAt(runner, claim, source, check.confidence);
	const differs = firstDifference(check.result, jsonRoundTrip(own.result));
	if (differs)
		throw new ConflictError(
			`This check cannot be certified (re-run: ${differs}: the stored result differs from a re-run); run the check again`
		);
	const stated = isExploratory(analyses) ? await rerunAt(runner, claim, source, confidence) : own;
	return {
		analyses,
		confidence,
		result: jsonRoundTrip(stated.result),
		canonical: stated.canonical
	};
}

/** The evidence input of a time-ordered certificate (the manifest's `trials` block included). */
export async function trialsEvidenceInput(
	database: Database,
	runner: EngineTasks,
	claim: ClaimAttributes,
	source: TrialsSource,
	ids: { certificateId: string; supersedes: string | null }
): Promise<EvidenceInput> {
	const { analyses, confidence, result, canonical } = await statedTrials(
		database,
		runner,
		claim,
		source
	);
	const fourier = fourierOf(result, claim);
	const input = {
		...ids,
		issuedAt: new Date().toISOString(),
		claimId: claim.id,
		checkId: source.check.id,
		claim: {
			title: claim.title,
			dimension: result.dimension,
			method: result.method,
			bases: result.bases,
			fourier,
			claimedSchmidtNumber: claim.claimedSchmidtNumber,
			manuscriptReference: claim.manuscriptReference ?? null
		},
		// The i.i.d. comparison beside the result runs with the engine's default resamples and seed.
		parameters: {
			resamples: DEFAULTS.resamples,
			confidence,
			seed: DEFAULTS.seed,
			subtractAccidentals: false
		},
		result,
		analyses,
		trials: evidenceTrials(result.mode, isGzip(source.uploaded)),
		uploaded: source.uploaded,
		uploadedFormat: 'csv' as const,
		canonical
	};
	// The manifest type names the i.i.d. result; this one is the trials kind (trials-evidence.ts).
	return input as unknown as EvidenceInput;
}
