import { redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { clearSessionCookie, requireSignedIn } from '$lib/server/http/auth-web';
import { runFormAction } from '$lib/server/http/form-action';
import { resendVerification, signOut, signOutEverywhere } from '$lib/server/accounts/accounts';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url }) => ({ sent: url.searchParams.has('sent') });

export const actions: Actions = {
	resend: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		return runFormAction(event, 'resend', {}, async () => {
			const { database } = await app();
			await resendVerification(database, actor);
			redirect(303, '/account?sent=1');
		});
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
