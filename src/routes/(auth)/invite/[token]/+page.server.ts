import { error, redirect } from '@sveltejs/kit';
import { invitedAddressFor, isInvitee } from '$lib/server/access/permissions';
import { app } from '$lib/server/app/app';
import { clearSessionCookie, requireSignedIn } from '$lib/server/http/auth-web';
import { runFormAction } from '$lib/server/http/form-action';
import { signOut } from '$lib/server/accounts/accounts';
import { acceptInvitation, findInvitation } from '$lib/server/accounts/invitation-links';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, locals }) => {
	const { database } = await app();
	const invitation = await findInvitation(database, params.token);
	if (!invitation) error(404, 'This invitation does not exist or was withdrawn.');
	const account = locals.user ?? null;
	// Someone signed in with another address learns only the masked one, as the action tells it.
	const email = invitedAddressFor(account, invitation);
	const query = `next=${encodeURIComponent(`/invite/${params.token}`)}&email=${encodeURIComponent(email)}`;
	return {
		invitation: { ...invitation, email },
		signedInAs: account?.email ?? null,
		matches: isInvitee(account, invitation),
		loginHref: `/login?${query}`,
		signupHref: `/signup?${query}`
	};
};

export const actions: Actions = {
	accept: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		return runFormAction(event, 'accept', {}, async () => {
			const { database } = await app();
			const { groupId } = await acceptInvitation(database, actor, event.params.token);
			redirect(303, `/group/${groupId}`);
		});
	},
	/** Signed in with another address: sign out, then sign in as the invited one. */
	switch: async ({ params, locals, cookies }) => {
		const { lucia } = await app();
		if (locals.session) await signOut(lucia, locals.session.id);
		clearSessionCookie(lucia, cookies);
		redirect(303, `/login?next=${encodeURIComponent(`/invite/${params.token}`)}`);
	}
};
