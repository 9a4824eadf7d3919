import { json } from '@sveltejs/kit';
import { issueJsonSchema } from '$lib/claims/api-bodies';
import { apiEndpoint } from '$lib/server/http/api';
import { readJson } from '$lib/server/http/read-body';
import { getCertificate, listCertificates } from '$lib/server/certificates/certificate-reads';
import { issueCertificate } from '$lib/server/certificates/certificates';

/** The claim's certificates, newest first. */
export const GET = apiEndpoint(async ({ event, actor, database }) => {
	return json(await listCertificates(database, actor, event.params.id!));
});

/** Issues a certificate for a finished check of the claim; a current one is superseded. */
export const POST = apiEndpoint(async ({ event, actor, database }) => {
	const { checkId } = await readJson(event.request, issueJsonSchema);
	const { id } = await issueCertificate(database, actor, event.params.id!, checkId);
	// The same record GET /api/v1/certificates/{id} answers (authors with their ORCID iDs too).
	const certificate = await getCertificate(database, actor, id);
	return json(certificate, { status: 201, headers: { location: `/api/v1/certificates/${id}` } });
});
