import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { app } from '$lib/server/app/app';
import { countSealLookup, sealRefusal } from '$lib/server/http/seal-limits';
import { checkBundle, lookupCertificate } from '$lib/server/certificates/certificate-reads';
import type { Actions, PageServerLoad } from './$types';

/** A bundle is a PDF, the verifier and a few small files; far below this. */
const MAX_BUNDLE_BYTES = 20 * 1024 * 1024;

const lookupQuery = z.string().trim().max(128);

/** Public (no sign-in): a certificate looked up by ID or fingerprint given as ?q=. */
export const load: PageServerLoad = async (event) => {
	const parsed = lookupQuery.safeParse(event.url.searchParams.get('q') ?? '');
	const query = parsed.success ? parsed.data : '';
	if (!query) return { query, lookup: null };
	await countSealLookup(event);
	const { database } = await app();
	return { query, lookup: await lookupCertificate(database, query) };
};

const refuse = (status: number, message: string) =>
	fail(status, {
		action: 'bundle',
		errors: { bundle: message } as Record<string, string>,
		values: {},
		place: null,
		checked: null
	});

export const actions: Actions = {
	/** Public: checks an uploaded evidence bundle against the keys this service has published. */
	bundle: async (event) => {
		const refusal = await sealRefusal(event, 'sealBundle');
		if (refusal) return refuse(429, refusal.message);
		const form = await event.request.formData().catch(() => null);
		const file = form?.get('bundle');
		if (!(file instanceof File) || file.size === 0)
			return refuse(400, 'Choose an evidence bundle (the .zip file) to check.');
		if (file.size > MAX_BUNDLE_BYTES)
			return refuse(413, `The file is larger than ${MAX_BUNDLE_BYTES} bytes; no bundle is.`);
		const { database } = await app();
		const zip = Buffer.from(await file.arrayBuffer());
		const { report, record, ledger } = await checkBundle(database, zip, event.getClientAddress());
		const checked = { fileName: file.name, report, record, ledger };
		return { action: 'bundle', errors: {} as Record<string, string>, checked };
	}
};
