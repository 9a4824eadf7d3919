import { error, redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { echoValues, startSession } from '$lib/server/http/auth-web';
import { formFailure } from '$lib/server/http/problems';
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
	signup: async ({ params, request, cookies }) => {
		const form = await request.formData();
		const values = echoValues(form, ['name']);
		const { database, lucia } = await app();
		let userId: string, claimId: string;
		try {
			({ userId, claimId } = await signUpEditor(database, params.token, {
				name: String(form.get('name') ?? ''),
				password: String(form.get('password') ?? '')
			}));
		} catch (problem) {
			return formFailure('signup', problem, values);
		}
		await startSession(lucia, cookies, userId);
		redirect(303, `/editor#claim-${claimId}`);
	}
};
