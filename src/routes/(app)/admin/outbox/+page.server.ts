import { app } from '$lib/server/app';
import { requireUser, serviceProblem } from '$lib/server/auth-web';
import { listOutbox } from '$lib/server/services/mail-outbox';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const user = requireUser(locals, url);
	const { database, mailCatcher } = await app();
	try {
		const outbox = await listOutbox(database, user.id, Number(url.searchParams.get('page') ?? '1'));
		return { outbox, catcherPort: mailCatcher?.port ?? null };
	} catch (problem) {
		serviceProblem(problem);
		throw problem;
	}
};
