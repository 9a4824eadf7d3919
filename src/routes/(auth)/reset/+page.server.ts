import { redirect } from '@sveltejs/kit';
import { formFields, resetRequestForm } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { echoValues, formRefusal } from '$lib/server/http/auth-web';
import { takeOrRefuse } from '$lib/server/core/rate-limits';
import { requestPasswordReset } from '$lib/server/accounts/accounts';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url }) => ({ sent: url.searchParams.has('sent') });

export const actions: Actions = {
	request: async (event) => {
		const form = await event.request.formData();
		const values = echoValues(form, ['email']);
		const parsed = resetRequestForm.safeParse(formFields(form));
		if (!parsed.success) return formRefusal(event, 'request', parsed.error, values);
		const { database, mailer } = await app();
		try {
			const what = 'Too many new-password requests from your network address.';
			await takeOrRefuse('resetRequest', event.getClientAddress(), what);
			await requestPasswordReset(database, mailer, parsed.data.email);
		} catch (problem) {
			return formRefusal(event, 'request', problem, values);
		}
		// The same answer whether or not the address has an account.
		redirect(303, '/reset?sent=1');
	}
};
