import { redirect } from '@sveltejs/kit';
import { CLAIM_FIELDS, claimInputSchema } from '$lib/claims/schema';
import { app } from '$lib/server/app/app';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { runFormAction } from '$lib/server/http/form-action';
import { createClaim } from '$lib/server/claims/claims';
import { ForbiddenError } from '$lib/server/core/errors';
import type { Actions } from './$types';

const FIELDS = [
	'groupId',
	...CLAIM_FIELDS,
	'trialsMode',
	'trialsProbabilities',
	'target',
	'targetFrom'
];

export const actions: Actions = {
	create: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const values = echoValues(await event.request.formData(), FIELDS);
		return runFormAction(event, 'create', values, async () => {
			if (!actor.emailVerified)
				throw new ForbiddenError('Confirm your e-mail address before creating claims.');
			const input = claimInputSchema.parse(values);
			const { database } = await app();
			const { id } = await createClaim(database, actor, input);
			redirect(303, `/claims/${id}`);
		});
	}
};
