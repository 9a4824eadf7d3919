import { redirect } from '@sveltejs/kit';
import { orcidForAccount, unlinkOrcid } from '$lib/server/accounts/orcid-links';
import { app } from '$lib/server/app/app';
import { clearSessionCookie, requireSignedIn } from '$lib/server/http/auth-web';
import { runFormAction } from '$lib/server/http/form-action';
import { resendVerification, signOut, signOutEverywhere } from '$lib/server/accounts/accounts';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url, locals }) => {
	const { database } = await app();
	const orcid = locals.user ? await orcidForAccount(database, locals.user.id) : null;
	const orcidNotice = url.searchParams.get('orcid');
	return { sent: url.searchParams.has('sent'), orcid, orcidNotice };
};

export const actions: Actions = {
	resend: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		return runFormAction(event, 'resend', {}, async () => {
			const { database } = await app();
			await resendVerification(database, actor);
			redirect(303, '/account?sent=1');
		});
	},
	unlinkOrcid: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const { database } = await app();
		await unlinkOrcid(database, actor);
		redirect(303, '/account?orcid=unlinked');
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
