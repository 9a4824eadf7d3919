import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { withdrawReasonField } from '$lib/claims/withdrawal';
import { apiEndpoint } from '$lib/server/http/api';
import { readJson } from '$lib/server/http/read-body';
import { withdrawClaim } from '$lib/server/claims/claim-withdraw';

const body = z.object({ reason: withdrawReasonField });

/** Withdraws the claim and every certificate of it, with the reason on the ledger. */
export const POST = apiEndpoint(async ({ event, actor, database }) => {
	const { reason } = await readJson(event.request, body);
	const { withdrawnCertificates } = await withdrawClaim(database, actor, event.params.id!, reason);
	return json({
		id: event.params.id,
		state: 'withdrawn',
		reason: reason.trim(),
		withdrawnCertificates
	});
});
