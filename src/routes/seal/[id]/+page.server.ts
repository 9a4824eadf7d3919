import { app } from '$lib/server/app/app';
import { countSealLookup } from '$lib/server/http/seal-limits';
import { lookupCertificate } from '$lib/server/certificates/certificate-reads';
import type { PageServerLoad } from './$types';

/** Public (no sign-in): the page a certificate's QR code and verify link open. */
export const load: PageServerLoad = async (event) => {
	const { params } = event;
	await countSealLookup(event);
	const { database } = await app();
	return { id: params.id, lookup: await lookupCertificate(database, params.id) };
};
