import { app } from '$lib/server/app';
import { requireUser, serviceProblem } from '$lib/server/auth-web';
import { getOutboxMessage } from '$lib/server/services/mail-outbox';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const user = requireUser(locals, url);
	const { database } = await app();
	try {
		return { message: await getOutboxMessage(database, user.id, params.id) };
	} catch (problem) {
		serviceProblem(problem);
		throw problem;
	}
};
