import { redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { clearSessionCookie, formRefusal, requireSignedIn } from '$lib/server/http/auth-web';
import { takeOrRefuse } from '$lib/server/core/rate-limits';
import { resendVerification, signOut, signOutEverywhere } from '$lib/server/accounts/accounts';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url }) => ({ sent: url.searchParams.has('sent') });

export const actions: Actions = {
	resend: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const { database, mailer } = await app();
		try {
			const what = 'You have asked for several links in a short time.';
			await takeOrRefuse('resendVerification', actor.userId, what);
			await resendVerification(database, mailer, actor);
		} catch (problem) {
			return formRefusal(event, 'resend', problem);
		}
		redirect(303, '/account?sent=1');
	},
	signout: async ({ locals, cookies }) => {
		const { lucia } = await app();
		if (locals.session) await signOut(lucia, locals.session.id);
		clearSessionCookie(lucia, cookies);
		redirect(303, '/login');
	},
	signoutEverywhere: async ({ locals, cookies, url }) => {
		const actor = requireSignedIn(locals, url);
		const { database, lucia } = await app();
		await signOutEverywhere(database, lucia, actor);
		clearSessionCookie(lucia, cookies);
		redirect(303, '/login');
	}
};
