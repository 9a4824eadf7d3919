import { redirect } from '@sveltejs/kit';
import { formFields, signUpForm } from '$lib/server/account-forms';
import { app } from '$lib/server/app';
import { echoValues, safeNext, startSession } from '$lib/server/auth-web';
import { formFailure } from '$lib/server/problems';
import { signUp } from '$lib/server/services/accounts';
import { invitationTokenIn } from '$lib/server/services/invitation-links';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	const next = safeNext(url.searchParams.get('next'), '/group');
	if (locals.user) redirect(303, next);
	return { next, email: url.searchParams.get('email') ?? '' };
};

export const actions: Actions = {
	signup: async ({ request, cookies }) => {
		const form = await request.formData();
		const values = echoValues(form, ['name', 'email']);
		const parsed = signUpForm.safeParse(formFields(form));
		if (!parsed.success) return formFailure('signup', parsed.error, values);
		const { database, lucia, mailer } = await app();
		let userId: string;
		try {
			const invitationToken = invitationTokenIn(safeNext(form.get('next') as string | null, ''));
			({ userId } = await signUp(database, mailer, parsed.data, { invitationToken }));
		} catch (problem) {
			return formFailure('signup', problem, values);
		}
		await startSession(lucia, cookies, userId);
		redirect(303, safeNext(form.get('next') as string | null, '/group'));
	}
};
