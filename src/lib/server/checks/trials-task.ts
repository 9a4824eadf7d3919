/**
 * Time-ordered trials on the check worker (issue 20): reading an upload against its claim, and
 * the supermartingale check. Relative imports only: this is bundled into the check worker.
 */
import { InputError } from '../../certify/counts';
import { sha256Hex } from '../../evidence/hash';
import {
	certifyTrials,
	type TrialsData,
	type TrialsMode,
	type TrialsResult
} from '../../certify/trials';
import { iidDataset, settingsPlan } from '../../certify/trials/settings-plan';
import { parseTrialsUpload } from './trials-upload';
import { previewTables, summarise, type SummaryOutcome, type SummaryTask } from './summary';
import type { ClaimAttributes } from '../db/models/Claim';
import type { CheckTask } from './task';

/** What a trials claim adds to a task: its mode and declared probabilities (null: uniform). */
export interface TrialsTaskPart {
	mode: TrialsMode;
	probabilities: number[] | null;
}

/** A trials claim's mode and probabilities for the worker; null for a counts claim. */
export const trialsPart = (claim: ClaimAttributes): TrialsTaskPart | null =>
	claim.trialsMode
		? { mode: claim.trialsMode, probabilities: claim.trialsProbabilities ?? null }
		: null;

async function* once(bytes: Uint8Array) {
	yield bytes;
}

const readTrials = (bytes: Uint8Array, dimension: number, mode: TrialsMode) =>
	parseTrialsUpload(once(bytes), dimension, mode);

/** The trials summed into tables, checked against the claim's bases and probabilities now. */
export async function summariseTrials(
	task: SummaryTask & { trials: TrialsTaskPart }
): Promise<SummaryOutcome> {
	try {
		const data: TrialsData = await readTrials(task.bytes, task.dimension, task.trials.mode);
		const plan = settingsPlan(data, task.bases, task.trials.probabilities ?? undefined);
		const tables = iidDataset(data, plan.bases);
		const summary = { ...summarise(tables, task.fourier), allows: [task.method] };
		// Trials in another order are other data: the file's own bytes name it (analyses, issue 15).
		const countsSha256 = sha256Hex(task.bytes);
		return { ok: true, summary, preview: previewTables(tables, plan.bases), countsSha256 };
	} catch (error) {
		if (!(error instanceof InputError)) throw error;
		const message = error.message.replace(/^line \d+(, column \d+)?: /, '');
		return { ok: false, message, line: error.line ?? null, column: error.column ?? null };
	}
}

/** The supermartingale certificate of the stored trials (with the i.i.d. one beside it). */
export async function runTrialsCheck(
	bytes: Uint8Array,
	task: CheckTask & { trials: TrialsTaskPart },
	inputSha256: string
): Promise<TrialsResult> {
	const data = await readTrials(bytes, task.dimension, task.trials.mode);
	return certifyTrials(data, {
		method: task.method,
		bases: task.bases,
		probabilities: task.trials.probabilities ?? undefined,
		fourier: task.fourier,
		confidence: task.confidence,
		inputSha256
	});
}
