import { redirect } from '@sveltejs/kit';
import { signInForm, formFields } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { echoValues, safeNext, startSession } from '$lib/server/http/auth-web';
import { runFormAction } from '$lib/server/http/form-action';
import { retryWords } from '$lib/server/core/rate-limits';
import { FieldError } from '$lib/server/core/errors';
import { signInFrom } from '$lib/server/accounts/sign-in';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	const next = safeNext(url.searchParams.get('next'));
	if (locals.user) redirect(303, next);
	const notice = url.searchParams.has('reset')
		? 'Your password has been changed. Sign in with the new one.'
		: url.searchParams.has('verified')
			? 'Your address is confirmed. Sign in to continue.'
			: url.searchParams.has('confirm')
				? 'Confirm your address with the link we mailed you, then sign in here.'
				: null;
	return { next, notice, email: url.searchParams.get('email') ?? '' };
};

const MISMATCH = 'That address and password do not match an account.';

export const actions: Actions = {
	login: async (event) => {
		const form = await event.request.formData();
		const values = echoValues(form, ['email']);
		return runFormAction(event, 'login', values, async () => {
			const input = signInForm.parse(formFields(form));
			const { database, lucia } = await app();
			const address = event.getClientAddress();
			const { userId, pauseSeconds: wait } = await signInFrom(database, input, { address });
			if (!userId) {
				const words = wait === null ? MISMATCH : `${MISMATCH} Try again ${retryWords(wait)}.`;
				throw new FieldError('', words);
			}
			await startSession(lucia, event.cookies, userId);
			redirect(303, safeNext(form.get('next') as string | null));
		});
	}
};
