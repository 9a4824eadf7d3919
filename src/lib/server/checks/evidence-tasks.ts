/**
 * The evidence tasks a worker thread runs: checking a stranger's bundle (/seal), and for a
 * certificate about to be issued its canonical counts and its self-check. They parse counts or
 * re-run the engine, so none may run on the request thread. Relative imports only: this is bundled into the worker.
 */
import { parseCounts } from '../../certify';
import type { EvidenceFiles } from '../../evidence/layout';
import { canonicalCountsText } from '../../evidence/manifest';
import { verifyEvidence, type VerificationReport } from '../../evidence/verify';
import { readZipStreamed, ZipError } from '../evidence/zip-read';

export interface BundleTask {
	zip: Uint8Array;
	/** The keys this service has published: a bundle signed by any other is not its own. */
	trustedKeyIds: string[];
}

/** A report that failed before any file could be read. */
const unreadable = (message: string): VerificationReport => ({
	valid: false,
	failedItem: 'zip',
	message,
	certificateId: null,
	fingerprint: null,
	keyId: null,
	anchored: false,
	checkpoint: null,
	passed: [],
	otherEngine: null
});

/** Named task `verifyBundle`: inflates the zip as streams, then runs the whole verifier. */
export async function verifyBundle(task: BundleTask): Promise<VerificationReport> {
	let files: EvidenceFiles;
	try {
		files = await readZipStreamed(
			Buffer.from(task.zip.buffer, task.zip.byteOffset, task.zip.byteLength)
		);
	} catch (error) {
		if (!(error instanceof ZipError)) throw error;
		return unreadable(error.message);
	}
	return verifyEvidence(files, { trustedKeyIds: task.trustedKeyIds });
}

/** Named task `selfCheck`: freshly made evidence, checked as a stranger would check it. */
export function selfCheck(task: { files: EvidenceFiles }): VerificationReport {
	return verifyEvidence(task.files);
}

/** Named task `canonicalCounts`: the uploaded counts as the manifest records them. */
export function canonicalCounts(task: { bytes: Uint8Array; dimension: number }): string {
	return canonicalCountsText(parseCounts(task.bytes, task.dimension));
}
