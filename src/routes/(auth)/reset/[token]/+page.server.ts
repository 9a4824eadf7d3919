import { redirect } from '@sveltejs/kit';
import { formFields, newPasswordForm } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { clearSessionCookie } from '$lib/server/http/auth-web';
import { formFailure } from '$lib/server/http/problems';
import { resetLinkState, resetPassword, type LinkResult } from '$lib/server/accounts/accounts';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const { database } = await app();
	const { state } = await resetLinkState(database, params.token);
	return { state };
};

export const actions: Actions = {
	reset: async ({ params, request, cookies, url }) => {
		const parsed = newPasswordForm.safeParse(formFields(await request.formData()));
		if (!parsed.success) return formFailure('reset', parsed.error);
		const { database, lucia, mailer } = await app();
		let result: LinkResult;
		try {
			result = await resetPassword(database, lucia, mailer, params.token, parsed.data.password);
		} catch (problem) {
			return formFailure('reset', problem);
		}
		// A used or expired link: the page, loaded again, says which.
		if (!result.ok) redirect(303, url.pathname);
		// Every session of the account has ended, this browser's included.
		clearSessionCookie(lucia, cookies);
		redirect(303, '/login?reset=1');
	}
};
