/**
 * Named worker task `trialsEvidence`: for a time-ordered certificate about to be issued, the
 * stored trials re-read (gzip or plain) and re-run at the level the certificate states, with the
 * canonical text of the trials summed. Relative imports only: this is bundled into the worker.
 */
import type { FourierConvention } from '../../certify/bases';
import { certifyTrials, type TrialsMode, type TrialsResult } from '../../certify/trials';
import { plainTrialsBytes } from '../../certify/trials/inflate';
import { parseTrials } from '../../certify/trials/parse';
import { trialsCountsText } from '../../evidence/trials-evidence';

export interface TrialsEvidenceTask {
	bytes: Uint8Array;
	dimension: number;
	mode: TrialsMode;
	method: string;
	bases: number[];
	probabilities: number[];
	fourier: FourierConvention;
	confidence: number;
	inputSha256: string;
}

export interface TrialsEvidenceParts {
	result: TrialsResult;
	/** counts-canonical.json: the trials summed into count tables. */
	canonical: string;
}

export function trialsEvidence(task: TrialsEvidenceTask): TrialsEvidenceParts {
	const data = parseTrials(plainTrialsBytes(task.bytes), task.dimension, task.mode);
	const { method, bases, probabilities, fourier, confidence, inputSha256 } = task;
	const result = certifyTrials(data, {
		method,
		bases,
		probabilities,
		fourier,
		confidence,
		inputSha256
	});
	return { result, canonical: trialsCountsText(data, result.bases) };
}
