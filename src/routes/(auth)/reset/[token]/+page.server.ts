import { redirect } from '@sveltejs/kit';
import { formFields, newPasswordForm } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { clearSessionCookie } from '$lib/server/http/auth-web';
import { resetLinkState, resetPassword } from '$lib/server/accounts/accounts';
import { runFormAction } from '$lib/server/http/form-action';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const { database } = await app();
	const { state } = await resetLinkState(database, params.token);
	return { state };
};

export const actions: Actions = {
	reset: async (event) => {
		const form = await event.request.formData();
		return runFormAction(event, 'reset', {}, async () => {
			const { password } = newPasswordForm.parse(formFields(form));
			const { database, lucia } = await app();
			const result = await resetPassword(database, lucia, event.params.token, password);
			// A used or expired link: the page, loaded again, says which.
			if (!result.ok) redirect(303, event.url.pathname);
			// Every session of the account has ended, this browser's included.
			clearSessionCookie(lucia, event.cookies);
			redirect(303, '/login?reset=1');
		});
	}
};
