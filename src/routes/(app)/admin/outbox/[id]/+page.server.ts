import { redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { requireSignedIn } from '$lib/server/http/auth-web';
import { formFailure, pageProblem } from '$lib/server/http/problems';
import { getOutboxMessage, requeueOutboxMessage } from '$lib/server/mail/mail-outbox';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database, mailCatcher } = await app();
	// With a real mail server, links that open someone's account stay hidden from admins.
	const options = { revealSecretLinks: mailCatcher !== null };
	const message = await getOutboxMessage(database, actor, params.id, options).catch(pageProblem);
	return { message };
};

export const actions: Actions = {
	requeue: async ({ locals, params, url }) => {
		const actor = requireSignedIn(locals, url);
		const { database, mailRunner } = await app();
		try {
			await requeueOutboxMessage(database, actor, params.id);
		} catch (problem) {
			return formFailure('requeue', problem);
		}
		mailRunner.wake();
		redirect(303, `/admin/outbox/${params.id}`);
	}
};
