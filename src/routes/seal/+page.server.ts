import { z } from 'zod';
import { app } from '$lib/server/app/app';
import { runFormAction } from '$lib/server/http/form-action';
import { ApiError } from '$lib/server/http/problems';
import { pageRefused } from '$lib/server/http/page-refusal';
import { checkBundle, lookupFrom } from '$lib/server/certificates/certificate-reads';
import { FieldError } from '$lib/server/core/errors';
import type { Actions, PageServerLoad } from './$types';

/** A bundle is a PDF, the verifier and a few small files; far below this. */
const MAX_BUNDLE_BYTES = 20 * 1024 * 1024;

const lookupQuery = z.string().trim().max(128);

/** Public (no sign-in): a certificate looked up by ID or fingerprint given as ?q=. */
export const load: PageServerLoad = async (event) => {
	const parsed = lookupQuery.safeParse(event.url.searchParams.get('q') ?? '');
	const query = parsed.success ? parsed.data : '';
	if (!query) return { query, lookup: null };
	const { database } = await app();
	const from = event.getClientAddress();
	const lookup = await lookupFrom(database, query, from).catch((e) => pageRefused(event, e));
	return { query, lookup };
};

export const actions: Actions = {
	/** Public: checks an uploaded evidence bundle against the keys this service has published. */
	bundle: (event) =>
		runFormAction(event, 'bundle', {}, async () => {
			const form = await event.request.formData().catch(() => null);
			const file = form?.get('bundle');
			if (!(file instanceof File) || file.size === 0)
				throw new FieldError('bundle', 'Choose an evidence bundle (the .zip file) to check.');
			if (file.size > MAX_BUNDLE_BYTES) {
				const words = `The file is larger than ${MAX_BUNDLE_BYTES} bytes; no bundle is.`;
				throw new ApiError(413, 'too_large', words, 'bundle');
			}
			const { database } = await app();
			const zip = Buffer.from(await file.arrayBuffer());
			const { report, record, ledger } = await checkBundle(database, zip, event.getClientAddress());
			const checked = { fileName: file.name, report, record, ledger };
			return { action: 'bundle', errors: {} as Record<string, string>, checked };
		})
};
