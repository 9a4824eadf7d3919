import { z } from 'zod';
import { app } from '$lib/server/app';
import { requireSignedIn } from '$lib/server/auth-web';
import { pageProblem } from '$lib/server/problems';
import { listOutbox } from '$lib/server/services/mail-outbox';
import type { PageServerLoad } from './$types';

const statusFilter = z
	.enum(['queued', 'sending', 'retrying', 'failed', 'sent', 'held'])
	.nullable()
	.catch(null);

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database, mailCatcher } = await app();
	const status = statusFilter.parse(url.searchParams.get('status'));
	const page = Number(url.searchParams.get('page') ?? '1');
	const outbox = await listOutbox(database, actor, page, status).catch(pageProblem);
	return { outbox, status, catcherPort: mailCatcher?.port ?? null };
};
