/**
 * A fidelity-target claim's calibration run (witnesses.md §4.3′): one file, as the multipart part
 * `targetRun` or as a raw text/csv or application/json body (name from ?name=). 413 above the
 * counts limit; a form's empty part is left to the service, which names the field.
 */
import { MAX_COUNTS_FILE_BYTES } from '$lib/certify';
import { TARGET_RUN_FIELD } from '$lib/claims/target';
import { ApiError } from './problems';
import { readMultipart } from './multipart';
import { readBody } from './read-body';

export interface TargetRunUpload {
	bytes: Uint8Array;
	originalName: string;
}

/** The run from a form's part (the claim page's form, or an API multipart body). */
export async function targetRunOfForm(form: FormData): Promise<TargetRunUpload> {
	const part = form.get(TARGET_RUN_FIELD);
	if (!(part instanceof File)) return { bytes: new Uint8Array(), originalName: '' };
	return { bytes: new Uint8Array(await part.arrayBuffer()), originalName: part.name };
}

export async function readTargetRunUpload(request: Request, url: URL): Promise<TargetRunUpload> {
	const type = (request.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	if (type === 'multipart/form-data') {
		const form = await readMultipart(request, MAX_COUNTS_FILE_BYTES);
		return targetRunOfForm(form);
	}
	if (type === 'text/csv' || type === 'application/json') {
		const bytes = await readBody(request, MAX_COUNTS_FILE_BYTES);
		const fallback = type === 'text/csv' ? 'calibration-run.csv' : 'calibration-run.json';
		return { bytes, originalName: url.searchParams.get('name')?.trim() || fallback };
	}
	await readBody(request, MAX_COUNTS_FILE_BYTES).catch(() => undefined);
	throw new ApiError(
		415,
		'unsupported_media_type',
		`Send the calibration run as multipart/form-data (field "${TARGET_RUN_FIELD}"), text/csv or application/json.`
	);
}
