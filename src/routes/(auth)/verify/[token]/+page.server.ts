import { redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { verificationLinkState, verifyEmail } from '$lib/server/accounts/accounts';
import type { Actions, PageServerLoad } from './$types';

// The link only shows a button: mail scanners that open links must not use up the token.
export const load: PageServerLoad = async ({ params }) => {
	const { database } = await app();
	const { state } = await verificationLinkState(database, params.token);
	return { state };
};

export const actions: Actions = {
	confirm: async ({ params, locals, url }) => {
		const { database } = await app();
		const result = await verifyEmail(database, params.token);
		// A used or expired link: the page, loaded again, says which.
		if (!result.ok) redirect(303, url.pathname);
		redirect(303, locals.user ? '/group?verified=1' : '/login?verified=1');
	}
};
