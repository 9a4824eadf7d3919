import { redirect } from '@sveltejs/kit';
import { signInForm, formFields } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { echoValues, formRefusal, safeNext, startSession } from '$lib/server/http/auth-web';
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
		const { request, cookies } = event;
		const form = await request.formData();
		const values = echoValues(form, ['email']);
		const parsed = signInForm.safeParse(formFields(form));
		if (!parsed.success) return formRefusal(event, 'login', parsed.error, values);
		const { database, lucia } = await app();
		let outcome;
		try {
			outcome = await signInFrom(database, parsed.data, { address: event.getClientAddress() });
		} catch (problem) {
			return formRefusal(event, 'login', problem, values);
		}
		if (!outcome.userId) {
			const wait = outcome.pauseSeconds;
			const words = wait === null ? MISMATCH : `${MISMATCH} Try again ${retryWords(wait)}.`;
			return formRefusal(event, 'login', new FieldError('', words), values);
		}
		await startSession(lucia, cookies, outcome.userId);
		redirect(303, safeNext(form.get('next') as string | null));
	}
};
