import { z } from 'zod';
import { app } from '$lib/server/app';
import { requireUser, serviceProblem } from '$lib/server/auth-web';
import { listOutbox } from '$lib/server/services/mail-outbox';
import type { PageServerLoad } from './$types';

const statusFilter = z
	.enum(['queued', 'sending', 'retrying', 'failed', 'sent'])
	.nullable()
	.catch(null);

export const load: PageServerLoad = async ({ locals, url }) => {
	const user = requireUser(locals, url);
	const { database, mailCatcher } = await app();
	const status = statusFilter.parse(url.searchParams.get('status'));
	const page = Number(url.searchParams.get('page') ?? '1');
	try {
		const outbox = await listOutbox(database, user.id, page, status);
		return { outbox, status, catcherPort: mailCatcher?.port ?? null };
	} catch (problem) {
		serviceProblem(problem);
		throw problem;
	}
};
