/** The upload form's files, read and size-checked before anything is stored. */
import { MAX_COUNTS_FILE_BYTES } from '$lib/certify';
import { FieldError } from '$lib/server/core/errors';

/** The counts file (and optional calibration file); names the counts file in `values`. */
export async function uploadFrom(form: FormData, values: Record<string, string>) {
	const file = form.get('counts');
	const calibrationFile = form.get('calibration');
	// The file's name is the one value worth echoing: the page says which file was refused.
	if (file instanceof File) values.counts = file.name;
	if (!(file instanceof File) || file.size === 0)
		throw new FieldError('counts', 'Choose a counts file (CSV or JSON) to upload.');
	if (file.size > MAX_COUNTS_FILE_BYTES)
		throw new FieldError(
			'counts',
			`The file is ${file.size} bytes; the limit is ${MAX_COUNTS_FILE_BYTES / 2 ** 20} MiB.`
		);
	const calibration =
		calibrationFile instanceof File && calibrationFile.size > 0
			? new Uint8Array(await calibrationFile.arrayBuffer())
			: null;
	return { bytes: new Uint8Array(await file.arrayBuffer()), originalName: file.name, calibration };
}
