import { app } from '$lib/server/app';
import { requireSignedIn } from '$lib/server/auth-web';
import { pageProblem } from '$lib/server/problems';
import { listOutbox } from '$lib/server/services/mail-outbox';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database, mailCatcher } = await app();
	const page = Number(url.searchParams.get('page') ?? '1');
	const outbox = await listOutbox(database, actor, page).catch(pageProblem);
	return { outbox, catcherPort: mailCatcher?.port ?? null };
};
