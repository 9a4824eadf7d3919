import { redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { requireSignedIn } from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { runFormAction } from '$lib/server/http/form-action';
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
	requeue: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		return runFormAction(event, 'requeue', {}, async () => {
			const { database, mailRunner } = await app();
			await requeueOutboxMessage(database, actor, event.params.id);
			mailRunner.wake();
			redirect(303, `/admin/outbox/${event.params.id}`);
		});
	}
};
