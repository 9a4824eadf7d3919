import { error } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { requireSignedIn } from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { getCertificate, lookupCertificate } from '$lib/server/certificates/certificate-reads';
import { getClaim } from '$lib/server/claims/claims';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	const [claim, certificate] = await Promise.all([
		getClaim(database, actor, params.id),
		getCertificate(database, actor, params.certificateId)
	]).catch(pageProblem);
	// Another claim's certificate under this claim's address is not found, so ids do not leak.
	if (certificate.claimId !== claim.id)
		error(404, { message: 'No such certificate.', code: 'not_found' });
	// The reason and date, as the public page gives them (from the ledger's withdraw event).
	const record =
		certificate.status === 'withdrawn' ? await lookupCertificate(database, certificate.id) : null;
	const withdrawal = record && record.status !== 'unknown' ? record.withdrawal : null;
	const verifyUrl = new URL(certificate.urls.verify, url.origin).href;
	return { claim, certificate, verifyUrl, withdrawal };
};
