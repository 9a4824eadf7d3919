import { fail, redirect } from '@sveltejs/kit';
import { formFields, newPasswordForm } from '$lib/server/account-forms';
import { app } from '$lib/server/app';
import { clearSessionCookie, fieldErrors, serviceProblem } from '$lib/server/auth-web';
import { resetLinkState, resetPassword, type LinkResult } from '$lib/server/services/accounts';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const { database } = await app();
	const { state } = await resetLinkState(database, params.token);
	return { state };
};

export const actions: Actions = {
	reset: async ({ params, request, cookies }) => {
		const parsed = newPasswordForm.safeParse(formFields(await request.formData()));
		if (!parsed.success) return fail(400, { errors: fieldErrors(parsed.error), reason: null });
		const { database, lucia, mailer } = await app();
		let result: LinkResult;
		try {
			result = await resetPassword(database, lucia, mailer, params.token, parsed.data.password);
		} catch (problem) {
			return fail(400, { errors: serviceProblem(problem), reason: null });
		}
		if (!result.ok) return fail(400, { errors: {}, reason: result.reason });
		// Every session of the account has ended, this browser's included.
		clearSessionCookie(lucia, cookies);
		redirect(303, '/login?reset=1');
	}
};
