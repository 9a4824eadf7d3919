import { redirect } from '@sveltejs/kit';
import { formFields, signUpForm } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { echoValues, formRefusal, safeNext, startSession } from '$lib/server/http/auth-web';
import { takeOrRefuse } from '$lib/server/core/rate-limits';
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
		const parsed = signUpForm.safeParse(formFields(form));
		if (!parsed.success) return formRefusal(event, 'signup', parsed.error, values);
		const { database, lucia, mailer } = await app();
		const next = safeNext(form.get('next') as string | null, '/group');
		let outcome;
		try {
			const what = 'Too many sign-ups from your network address.';
			await takeOrRefuse('signUp', event.getClientAddress(), what);
			const invitationToken = invitationTokenIn(next);
			outcome = await signUp(database, mailer, parsed.data, { invitationToken });
		} catch (problem) {
			return formRefusal(event, 'signup', problem, values);
		}
		if (outcome.invited) {
			await startSession(lucia, event.cookies, outcome.userId);
			redirect(303, next);
		}
		// The same answer for a new address and for one that has an account: the mail differs.
		redirect(303, `/signup?sent=1&next=${encodeURIComponent(next)}`);
	}
};
