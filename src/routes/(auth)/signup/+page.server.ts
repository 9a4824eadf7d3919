import { redirect } from '@sveltejs/kit';
import { formFields, signUpForm } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { echoValues, safeNext, startSession } from '$lib/server/http/auth-web';
import { runFormAction } from '$lib/server/http/form-action';
import { signUp } from '$lib/server/accounts/accounts';
import { invitationTokenIn } from '$lib/server/accounts/invitation-links';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	const next = safeNext(url.searchParams.get('next'), '/group');
	if (locals.user) redirect(303, next);
	return { next, email: url.searchParams.get('email') ?? '', sent: url.searchParams.has('sent') };
};

export const actions: Actions = {
	signup: async (event) => {
		const form = await event.request.formData();
		const values = echoValues(form, ['name', 'email']);
		return runFormAction(event, 'signup', values, async () => {
			const input = signUpForm.parse(formFields(form));
			const { database, lucia } = await app();
			const next = safeNext(form.get('next') as string | null, '/group');
			const invitationToken = invitationTokenIn(next);
			const address = event.getClientAddress();
			const outcome = await signUp(database, input, { invitationToken, address });
			if (outcome.invited) {
				await startSession(lucia, event.cookies, outcome.userId);
				redirect(303, next);
			}
			// The same answer for a new address and for one that has an account: the mail differs.
			redirect(303, `/signup?sent=1&next=${encodeURIComponent(next)}`);
		});
	}
};
