/**
 * The counts files of a multipart upload (the claim page's form and the API alike): every part
 * named `counts`, and beside them either no `basis` part or one per file, in the same order
 * (blank: the file names its bases itself). The basis of a single-grid file is given this way.
 */
import { MAX_COUNTS_FILE_BYTES } from '$lib/certify/counts';
import type { CountsFileUpload } from '../datasets/counts-files';
import { FieldError } from '../core/field-error';

/** A basis field's text: blank means none given; else a whole number. */
export function basisField(value: FormDataEntryValue | string | null, file: string): number | null {
	if (value === null) return null;
	if (typeof value !== 'string')
		throw new FieldError('basis', `The basis of ${file} takes a whole number, not a file.`);
	const text = value.trim();
	if (text === '') return null;
	if (!/^\d{1,6}$/.test(text))
		throw new FieldError('basis', `The basis of ${file} takes a whole number, got '${text}'.`);
	return Number(text);
}

/** The chosen files: an empty file picker still sends one part with no name and no bytes. */
function chosenFiles(form: FormData): File[] {
	const parts = form.getAll('counts');
	if (parts.some((part) => !(part instanceof File)))
		throw new FieldError('counts', 'Send each counts file as a file part named "counts".');
	return (parts as File[]).filter((file) => file.name !== '' || file.size > 0);
}

/** The files with their bases; FieldError naming `counts` or `basis` for what does not fit. */
export async function countsFilesOfForm(form: FormData): Promise<CountsFileUpload[]> {
	const files = chosenFiles(form);
	const bases = form.getAll('basis');
	if (bases.length > 0 && bases.length !== files.length)
		throw new FieldError(
			'basis',
			`Give one basis per counts file, blank for a file that names its bases: ${files.length} file(s), ${bases.length} basis field(s).`
		);
	for (const file of files)
		if (file.size > MAX_COUNTS_FILE_BYTES)
			throw new FieldError(
				'counts',
				`${file.name} is ${file.size} bytes; the limit is ${MAX_COUNTS_FILE_BYTES / 2 ** 20} MiB.`
			);
	return Promise.all(
		files.map(async (file, i) => ({
			name: file.name || 'counts',
			basis: basisField(bases[i] ?? null, file.name || `file ${i + 1}`),
			bytes: new Uint8Array(await file.arrayBuffer())
		}))
	);
}
