/** A counts upload: multipart parts `counts` (and `calibration`), or a raw CSV or JSON body. */
import { MAX_COUNTS_FILE_BYTES } from '$lib/certify';
import { ApiError } from './problems';
import { readBody } from './read-body';
import type { CountsFileUpload } from '../datasets/counts-files';
import { basisField, countsFilesOfForm } from './counts-form';

const MULTIPART_OVERHEAD = 64 * 1024;

/** A multipart body of at most `limit` bytes of files (plus room for the parts' headers). */
export async function readMultipart(request: Request, limit: number): Promise<FormData> {
	const body = await readBody(request, limit + MULTIPART_OVERHEAD);
	return new Response(body, { headers: { 'content-type': request.headers.get('content-type')! } })
		.formData()
		.catch(() => {
			throw new ApiError(400, 'bad_input', 'The multipart body cannot be read.');
		});
}

/**
 * Counts files sent as multipart parts `counts` (several at once, each with an optional `basis`
 * part in the same order: http/counts-form.ts), or one file as a raw text/csv or application/json
 * body (name from ?name= or "counts.csv"/"counts.json", basis from ?basis=). 413 above
 * MAX_COUNTS_FILE_BYTES in all.
 */
export async function readCountsUpload(
	request: Request,
	url: URL
): Promise<{ files: CountsFileUpload[]; calibration?: Uint8Array }> {
	const type = (request.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	const tooLarge = new ApiError(
		413,
		'too_large',
		`The counts (all files together) are larger than the limit of ${MAX_COUNTS_FILE_BYTES} bytes.`
	);
	if (type === 'multipart/form-data') {
		const form = await readMultipart(request, MAX_COUNTS_FILE_BYTES);
		if (!form.getAll('counts').some((part) => part instanceof File))
			throw new ApiError(
				400,
				'bad_input',
				'Send the counts file in the multipart field "counts".',
				'counts'
			);
		const parts = form.getAll('counts') as File[];
		if (parts.reduce((sum, part) => sum + (part.size ?? 0), 0) > MAX_COUNTS_FILE_BYTES)
			throw tooLarge;
		// An optional calibration file beside the counts (witnesses.md §4.4).
		const calibration = form.get('calibration');
		return {
			files: await countsFilesOfForm(form),
			...(calibration instanceof File && calibration.size > 0
				? { calibration: new Uint8Array(await calibration.arrayBuffer()) }
				: {})
		};
	}
	if (type === 'text/csv' || type === 'application/json') {
		const bytes = await readBody(request, MAX_COUNTS_FILE_BYTES).catch((error) => {
			throw error instanceof ApiError && error.status === 413 ? tooLarge : error;
		});
		const fallback = type === 'text/csv' ? 'counts.csv' : 'counts.json';
		const name = url.searchParams.get('name')?.trim() || fallback;
		return { files: [{ name, bytes, basis: basisField(url.searchParams.get('basis'), name) }] };
	}
	// Read what was sent first: answering before the body is in resets the connection mid-upload.
	await readBody(request, MAX_COUNTS_FILE_BYTES).catch(() => undefined);
	throw new ApiError(
		415,
		'unsupported_media_type',
		'Send the counts as multipart/form-data (field "counts"), text/csv or application/json.'
	);
}
