import { redirect } from '@sveltejs/kit';
import { formFields, resetRequestForm } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { echoValues } from '$lib/server/http/auth-web';
import { runFormAction } from '$lib/server/http/form-action';
import { requestPasswordReset } from '$lib/server/accounts/accounts';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url }) => ({ sent: url.searchParams.has('sent') });

export const actions: Actions = {
	request: async (event) => {
		const form = await event.request.formData();
		const values = echoValues(form, ['email']);
		return runFormAction(event, 'request', values, async () => {
			const { email } = resetRequestForm.parse(formFields(form));
			const { database } = await app();
			await requestPasswordReset(database, email, { address: event.getClientAddress() });
			// The same answer whether or not the address has an account.
			redirect(303, '/reset?sent=1');
		});
	}
};
