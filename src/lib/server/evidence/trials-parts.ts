/**
 * The counts part of a time-ordered certificate's evidence: the manifest's hashes of the trials
 * file and of the trials summed, and the coincidences per basis for page one. The service brings
 * the canonical text and the totals (read on the work pool); other callers have them worked out here.
 */
import { plainTrialsBytes } from '../../certify/trials/inflate';
import { parseTrials } from '../../certify/trials/parse';
import { sha256Hex } from '../../evidence/hash';
import { trialsCountsText, type EvidenceTrials } from '../../evidence/trials-evidence';

/** What of the evidence input this needs (a type of its own, so artifacts.ts alone imports this). */
interface TrialsPartsInput {
	result: { bases: number[] };
	claim: { dimension: number };
	uploaded: Uint8Array;
	canonical?: string;
	context?: { coincidencesPerBasis?: { basis: number; total: number }[] };
	trials: EvidenceTrials;
}

export function trialsCountsParts(input: TrialsPartsInput) {
	const bases = input.result.bases;
	const given = input.context?.coincidencesPerBasis;
	const data =
		input.canonical && given
			? null
			: parseTrials(plainTrialsBytes(input.uploaded), input.claim.dimension, input.trials.mode);
	const canonical = input.canonical ?? trialsCountsText(data!, bases);
	const perBasis =
		given?.filter((b) => bases.includes(b.basis)) ??
		bases.map((basis) => ({
			basis,
			total: (data!.tables.get(basis) ?? new Float64Array(0)).reduce((sum, c) => sum + c, 0)
		}));
	const counts = {
		uploadedSha256: sha256Hex(input.uploaded),
		uploadedFormat: 'csv' as const,
		uploadedBytes: input.uploaded.byteLength,
		canonicalSha256: sha256Hex(canonical)
	};
	return { canonical, counts, perBasis };
}
