import { redirect } from '@sveltejs/kit';
import { CLAIM_FIELDS } from '$lib/claims/schema';
import { app } from '$lib/server/app/app';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { runFormAction } from '$lib/server/http/form-action';
import { claimForEditing, updateClaim } from '$lib/server/claims/claim-edit';
import type { Actions, PageServerLoad } from './$types';

const FIELDS = [...CLAIM_FIELDS];

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	const { claim, checked } = await claimForEditing(database, actor, params.id).catch(pageProblem);
	const values = {
		title: claim.title,
		sourceDescription: claim.sourceDescription,
		dimension: String(claim.dimension),
		method: claim.method,
		bases: claim.bases.join(','),
		fourier: claim.fourier,
		claimedSchmidtNumber: String(claim.claimedSchmidtNumber),
		manuscriptReference: claim.manuscriptReference ?? ''
	};
	return { claim: { id: claim.id, title: claim.title }, checked, values };
};

export const actions: Actions = {
	save: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const values = echoValues(await event.request.formData(), FIELDS);
		return runFormAction(event, 'save', values, async () => {
			const { database } = await app();
			// updateClaim validates, with the declared target and trials settings kept as made.
			await updateClaim(database, actor, event.params.id, values);
			redirect(303, `/claims/${event.params.id}`);
		});
	}
};
