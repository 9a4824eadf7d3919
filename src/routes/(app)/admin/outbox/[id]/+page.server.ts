import { app } from '$lib/server/app';
import { requireSignedIn } from '$lib/server/auth-web';
import { pageProblem } from '$lib/server/problems';
import { getOutboxMessage } from '$lib/server/services/mail-outbox';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	return { message: await getOutboxMessage(database, actor, params.id).catch(pageProblem) };
};
