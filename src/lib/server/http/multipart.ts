/** A counts upload: the multipart field `counts` (and `calibration`), or a raw CSV or JSON body. */
import { MAX_COUNTS_FILE_BYTES } from '$lib/certify';
import { ApiError } from './problems';
import { readBody } from './read-body';

const MULTIPART_OVERHEAD = 64 * 1024;

/**
 * A counts file sent as the multipart field `counts`, or as a raw text/csv or application/json
 * body (name from ?name= or "counts.csv"/"counts.json"). 413 above MAX_COUNTS_FILE_BYTES.
 */
export async function readCountsUpload(
	request: Request,
	url: URL
): Promise<{ bytes: Uint8Array; originalName: string; calibration?: Uint8Array }> {
	const type = (request.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
	const tooLarge = new ApiError(
		413,
		'too_large',
		`The counts file is larger than the limit of ${MAX_COUNTS_FILE_BYTES} bytes.`
	);
	if (type === 'multipart/form-data') {
		const body = await readBody(request, MAX_COUNTS_FILE_BYTES + MULTIPART_OVERHEAD);
		const form = await new Response(body, {
			headers: { 'content-type': request.headers.get('content-type')! }
		})
			.formData()
			.catch(() => {
				throw new ApiError(400, 'bad_input', 'The multipart body cannot be read.');
			});
		const file = form.get('counts');
		if (!(file instanceof File))
			throw new ApiError(
				400,
				'bad_input',
				'Send the counts file in the multipart field "counts".',
				'counts'
			);
		if (file.size > MAX_COUNTS_FILE_BYTES) throw tooLarge;
		// An optional calibration file beside the counts (witnesses.md §4.4).
		const calibration = form.get('calibration');
		return {
			bytes: new Uint8Array(await file.arrayBuffer()),
			originalName: file.name || 'counts',
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
		return { bytes, originalName: url.searchParams.get('name')?.trim() || fallback };
	}
	// Read what was sent first: answering before the body is in resets the connection mid-upload.
	await readBody(request, MAX_COUNTS_FILE_BYTES).catch(() => undefined);
	throw new ApiError(
		415,
		'unsupported_media_type',
		'Send the counts as multipart/form-data (field "counts"), text/csv or application/json.'
	);
}
