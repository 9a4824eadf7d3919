import { redirect } from '@sveltejs/kit';
import { formFields, resetRequestForm } from '$lib/server/account-forms';
import { app } from '$lib/server/app';
import { echoValues } from '$lib/server/auth-web';
import { formFailure } from '$lib/server/problems';
import { requestPasswordReset } from '$lib/server/services/accounts';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url }) => ({ sent: url.searchParams.has('sent') });

export const actions: Actions = {
	request: async ({ request }) => {
		const form = await request.formData();
		const values = echoValues(form, ['email']);
		const parsed = resetRequestForm.safeParse(formFields(form));
		if (!parsed.success) return formFailure('request', parsed.error, values);
		const { database, mailer } = await app();
		await requestPasswordReset(database, mailer, parsed.data.email);
		// The same answer whether or not the address has an account.
		redirect(303, '/reset?sent=1');
	}
};
