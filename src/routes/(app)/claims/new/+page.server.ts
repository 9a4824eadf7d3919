import { fail, redirect } from '@sveltejs/kit';
import { claimInputSchema } from '$lib/claims/schema';
import { app } from '$lib/server/app';
import { echoValues, fieldErrors, requireUser } from '$lib/server/auth-web';
import { createClaim } from '$lib/server/services/claims';
import { ForbiddenError, NotFoundError } from '$lib/server/services/errors';
import type { Actions } from './$types';

const FIELDS = [
	'groupId',
	'title',
	'sourceDescription',
	'dimension',
	'method',
	'bases',
	'fourier',
	'claimedSchmidtNumber',
	'manuscriptReference'
];

export const actions: Actions = {
	create: async ({ request, locals, url }) => {
		const user = requireUser(locals, url);
		const values = echoValues(await request.formData(), FIELDS);
		if (!user.emailVerified) {
			return fail(403, {
				errors: { '': 'Confirm your e-mail address before creating claims.' },
				values
			});
		}
		const parsed = claimInputSchema.safeParse(values);
		if (!parsed.success) return fail(400, { errors: fieldErrors(parsed.error), values });

		const { database } = await app();
		let claimId: string;
		try {
			claimId = (await createClaim(database, user.id, parsed.data)).id;
		} catch (problem) {
			if (problem instanceof NotFoundError) {
				return fail(400, { errors: { groupId: 'Choose one of your groups.' }, values });
			}
			if (problem instanceof ForbiddenError) {
				return fail(403, { errors: { '': problem.message }, values });
			}
			throw problem;
		}
		redirect(303, `/claims/${claimId}`);
	}
};
