/** What the bundle's README adds for a certificate from time-ordered trials (issue 20). */
import type { EvidenceManifest } from '../../evidence/manifest';
import { isTrialsManifest } from '../../evidence/trials-evidence';

/** An empty string for counts certificates; else a paragraph naming the kind, file and assumption. */
export function trialsReadmeNote(manifest: EvidenceManifest): string {
	if (!isTrialsManifest(manifest)) return '';
	const { uploadedName, gzip, assumption } = manifest.trials;
	return [
		'',
		'A certificate from time-ordered trials (a test supermartingale)',
		`  ${uploadedName} is the trials file exactly as uploaded${gzip ? ' (gzip-compressed)' : ''}, one`,
		'  row per coincidence in time order; counts-canonical.json holds the trials summed.',
		'  verify.mjs reads the trials again, re-runs the supermartingale of every rung and compares',
		'  every p-value bit for bit; the order of the rows matters, not only their sums.',
		`  ${assumption}`,
		''
	].join('\n');
}
