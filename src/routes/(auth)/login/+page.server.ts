import { redirect } from '@sveltejs/kit';
import { signInForm, formFields } from '$lib/server/account-forms';
import { app } from '$lib/server/app';
import { echoValues, safeNext, startSession } from '$lib/server/auth-web';
import { formFailure } from '$lib/server/problems';
import { signIn } from '$lib/server/services/accounts';
import { FieldError } from '$lib/server/services/errors';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	const next = safeNext(url.searchParams.get('next'));
	if (locals.user) redirect(303, next);
	const notice = url.searchParams.has('reset')
		? 'Your password has been changed. Sign in with the new one.'
		: url.searchParams.has('verified')
			? 'Your address is confirmed. Sign in to continue.'
			: null;
	return { next, notice, email: url.searchParams.get('email') ?? '' };
};

export const actions: Actions = {
	login: async ({ request, cookies }) => {
		const form = await request.formData();
		const values = echoValues(form, ['email']);
		const parsed = signInForm.safeParse(formFields(form));
		if (!parsed.success) return formFailure('login', parsed.error, values);
		const { database, lucia } = await app();
		const account = await signIn(database, parsed.data.email, parsed.data.password);
		if (!account) {
			const mismatch = new FieldError('', 'That address and password do not match an account.');
			return formFailure('login', mismatch, values);
		}
		await startSession(lucia, cookies, account.userId);
		redirect(303, safeNext(form.get('next') as string | null));
	}
};
