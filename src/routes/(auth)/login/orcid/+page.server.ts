import { redirect } from '@sveltejs/kit';
import { signInForm, formFields } from '$lib/server/accounts/account-forms';
import { orcidPending } from '$lib/server/accounts/orcid-attempts';
import {
	ATTEMPT_COOKIE,
	PENDING_COOKIE,
	dropOrcidCookie
} from '$lib/server/accounts/orcid-cookies';
import { linkPendingByPassword } from '$lib/server/accounts/orcid-sign-in';
import { app } from '$lib/server/app/app';
import { echoValues, startSession } from '$lib/server/http/auth-web';
import { formRefused } from '$lib/server/http/form-action';
import { retryWords } from '$lib/server/core/rate-limits';
import { FieldError } from '$lib/server/core/errors';
import type { Actions, PageServerLoad } from './$types';

/** The iD ORCID vouched for that waits for a password sign-in to link it (null: none). */
export const load: PageServerLoad = ({ cookies }) => {
	const pending = orcidPending.peek(cookies.get(PENDING_COOKIE));
	return { pending: pending && { orcid: pending.orcid, name: pending.name } };
};

const MISMATCH = 'That address and password do not match an account.';

export const actions: Actions = {
	/** The password sign-in that links the waiting iD to that account. */
	link: async (event) => {
		const form = await event.request.formData();
		const values = echoValues(form, ['email']);
		const parsed = signInForm.safeParse(formFields(form));
		if (!parsed.success) return formRefused(event, 'link', parsed.error, values);
		const { database, lucia } = await app();
		const handle = event.cookies.get(PENDING_COOKIE);
		let outcome;
		try {
			outcome = await linkPendingByPassword(database, handle, parsed.data, {
				address: event.getClientAddress()
			});
		} catch (problem) {
			return formRefused(event, 'link', problem, values);
		}
		if (!outcome.userId) {
			const wait = outcome.pauseSeconds;
			const words = wait === null ? MISMATCH : `${MISMATCH} Try again ${retryWords(wait)}.`;
			return formRefused(event, 'link', new FieldError('', words), values);
		}
		dropOrcidCookie(event.cookies, PENDING_COOKIE);
		dropOrcidCookie(event.cookies, ATTEMPT_COOKIE);
		await startSession(lucia, event.cookies, outcome.userId);
		redirect(303, outcome.pending.next);
	}
};
