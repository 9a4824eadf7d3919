import { fail, redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app';
import { requireUser, serviceProblem } from '$lib/server/auth-web';
import { getOutboxMessage, requeueOutboxMessage } from '$lib/server/services/mail-outbox';
import { ConflictError } from '$lib/server/services/errors';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const user = requireUser(locals, url);
	const { database, mailCatcher } = await app();
	try {
		const options = { revealSecretLinks: mailCatcher !== null };
		return { message: await getOutboxMessage(database, user.id, params.id, options) };
	} catch (problem) {
		serviceProblem(problem);
		throw problem;
	}
};

export const actions: Actions = {
	requeue: async ({ locals, params, url }) => {
		const user = requireUser(locals, url);
		const { database, mailRunner } = await app();
		try {
			await requeueOutboxMessage(database, user.id, params.id);
		} catch (problem) {
			if (problem instanceof ConflictError)
				return fail(409, { errors: { form: problem.message }, values: {} });
			serviceProblem(problem);
			throw problem;
		}
		mailRunner.wake();
		redirect(303, `/admin/outbox/${params.id}`);
	}
};
