/** The upload form's files, read and checked (counts-form.ts) before anything is stored. */
import { countsFilesOfForm } from '$lib/server/http/counts-form';

/** The counts files with their bases and the optional calibration; names the files in `values`. */
export async function uploadFrom(form: FormData, values: Record<string, string>) {
	// The files' names are the one value worth echoing: the page says which were refused.
	const names = form.getAll('counts').flatMap((f) => (f instanceof File && f.name ? [f.name] : []));
	if (names.length) values.counts = names.join(', ');
	const files = await countsFilesOfForm(form);
	const calibrationFile = form.get('calibration');
	const calibration =
		calibrationFile instanceof File && calibrationFile.size > 0
			? new Uint8Array(await calibrationFile.arrayBuffer())
			: null;
	return { files, calibration };
}
