/**
 * One upload of several counts files (issue 18): labs keep one d × d grid per basis, one file
 * each, so an upload may hold several files, each a single grid with its basis given beside it
 * or a full file. They become one dataset: a counts set (certify/counts-set.ts) that keeps every
 * file's bytes and SHA-256; a single file without a given basis is stored exactly as uploaded.
 */
import { MAX_COUNTS_FILE_BYTES } from '$lib/certify/counts';
import { MAX_COUNTS_SET_FILES, writeCountsSet, type CountsSetFile } from '$lib/certify/counts-set';
import { tidyFileName } from '$lib/text-rules';
import type { Actor } from '../core/actor';
import { requireClaim } from '../access/permissions';
import type { Database } from '../db';
import { addDataset, type DatasetView } from './datasets';
import { FieldError } from '../core/field-error';

export type CountsFileUpload = CountsSetFile;

const MIB = MAX_COUNTS_FILE_BYTES / 2 ** 20;

/** The files' count and size, and names fit for the set's header lines. */
function checkedFiles(files: CountsFileUpload[]): CountsFileUpload[] {
	if (files.length === 0)
		throw new FieldError('counts', 'Choose a counts file (CSV, JSON or grids) to upload.');
	if (files.length > MAX_COUNTS_SET_FILES)
		throw new FieldError(
			'counts',
			`${files.length} files in one upload; the limit is ${MAX_COUNTS_SET_FILES}.`
		);
	const total = files.reduce((sum, f) => sum + f.bytes.byteLength, 0);
	if (total > MAX_COUNTS_FILE_BYTES)
		throw new FieldError(
			'counts',
			`The files hold ${total} bytes together; one upload may hold ${MIB} MiB.`
		);
	return files.map((f) => ({ ...f, name: tidyFileName(f.name, 'counts', 120) }));
}

/** The name a set is listed under: its files' names, shortened when there are many. */
function setName(files: CountsFileUpload[]): string {
	const names = files.map((f) => f.name);
	const shown = names.slice(0, 4).join(' + ');
	return names.length > 4 ? `${shown} + ${names.length - 4} more` : shown;
}

/**
 * Stores the files as one dataset of the claim (addDataset: validated before anything is
 * stored, nothing half-way). FieldError for an empty, oversized or (trials) unsupported upload;
 * InputError naming the file and its line for a bad file.
 */
export async function addCountsFiles(
	database: Database,
	actor: Actor,
	claimId: string,
	upload: { files: CountsFileUpload[]; calibration?: Uint8Array | null }
): Promise<DatasetView> {
	const claim = await requireClaim(database, actor, claimId, 'add-dataset');
	const files = checkedFiles(upload.files);
	const calibration = upload.calibration ?? null;
	const [first] = files;
	if (files.length === 1 && first.basis === null)
		return addDataset(database, actor, claimId, {
			bytes: first.bytes,
			originalName: first.name,
			calibration
		});
	if (claim.trialsMode)
		throw new FieldError(
			files.length > 1 ? 'counts' : 'basis',
			'A claim on time-ordered trials takes one trials file per upload, with no basis beside it.'
		);
	const bytes = writeCountsSet(files);
	return addDataset(database, actor, claimId, { bytes, originalName: setName(files), calibration });
}
