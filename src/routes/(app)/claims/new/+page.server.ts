import { redirect } from '@sveltejs/kit';
import { CLAIM_FIELDS, claimInputSchema } from '$lib/claims/schema';
import { app } from '$lib/server/app/app';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { formFailure } from '$lib/server/http/problems';
import { createClaim } from '$lib/server/claims/claims';
import { ForbiddenError } from '$lib/server/core/errors';
import type { Actions } from './$types';

const FIELDS = ['groupId', ...CLAIM_FIELDS, 'trialsMode', 'trialsProbabilities', 'target'];

export const actions: Actions = {
	create: async ({ request, locals, url }) => {
		const actor = requireSignedIn(locals, url);
		const values = echoValues(await request.formData(), FIELDS);
		if (!actor.emailVerified) {
			const unconfirmed = new ForbiddenError('Confirm your e-mail address before creating claims.');
			return formFailure('create', unconfirmed, values);
		}
		const parsed = claimInputSchema.safeParse(values);
		if (!parsed.success) return formFailure('create', parsed.error, values);
		const { database } = await app();
		let claimId: string;
		try {
			claimId = (await createClaim(database, actor, parsed.data)).id;
		} catch (problem) {
			return formFailure('create', problem, values);
		}
		redirect(303, `/claims/${claimId}`);
	}
};
