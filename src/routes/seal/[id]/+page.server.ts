import { app } from '$lib/server/app/app';
import { pageRefused } from '$lib/server/http/page-refusal';
import { lookupFrom } from '$lib/server/certificates/certificate-reads';
import type { PageServerLoad } from './$types';

/** Public (no sign-in): the page a certificate's QR code and verify link open. */
export const load: PageServerLoad = async (event) => {
	const { params } = event;
	const { database } = await app();
	const from = event.getClientAddress();
	const lookup = await lookupFrom(database, params.id, from).catch((e) => pageRefused(event, e));
	return { id: params.id, lookup };
};
