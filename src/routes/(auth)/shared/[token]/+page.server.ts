import { error, redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { echoValues, startSession } from '$lib/server/http/auth-web';
import { runFormAction } from '$lib/server/http/form-action';
import { findShareInvite, openShare, signUpEditor } from '$lib/server/review/share-open';
import type { Actions, PageServerLoad } from './$types';

const GONE = 'This link does not work: the share may have been withdrawn.';

/** A signed-in editor with the shared address goes straight to the claim; others choose. */
export const load: PageServerLoad = async ({ params, locals }) => {
	const { database } = await app();
	const invite = await findShareInvite(database, params.token);
	if (!invite) error(404, { message: GONE, code: 'not_found' });
	if (locals.actor.kind === 'user' && locals.user?.email === invite.email) {
		const claimId = await openShare(database, locals.actor, params.token).catch(() => null);
		if (claimId) redirect(303, `/editor#claim-${claimId}`);
	}
	const here = `/shared/${params.token}`;
	const query = `next=${encodeURIComponent(here)}&email=${encodeURIComponent(invite.email)}`;
	return { invite, signedInAs: locals.user?.email ?? null, loginHref: `/login?${query}` };
};

export const actions: Actions = {
	signup: async (event) => {
		const form = await event.request.formData();
		const values = echoValues(form, ['name']);
		return runFormAction(event, 'signup', values, async () => {
			const { database, lucia } = await app();
			const { userId, claimId } = await signUpEditor(database, event.params.token, {
				name: String(form.get('name') ?? ''),
				password: String(form.get('password') ?? '')
			});
			await startSession(lucia, event.cookies, userId);
			redirect(303, `/editor#claim-${claimId}`);
		});
	}
};
