import { z } from 'zod';
import { pageField } from '$lib/paging';
import { app } from '$lib/server/app/app';
import { requireSignedIn } from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { listOutbox } from '$lib/server/mail/mail-outbox';
import type { PageServerLoad } from './$types';

const statusFilter = z
	.enum(['queued', 'sending', 'retrying', 'failed', 'sent', 'held'])
	.nullable()
	.catch(null);
const pageQuery = z.object({ page: pageField() });

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database, mailCatcher } = await app();
	const status = statusFilter.parse(url.searchParams.get('status'));
	const paging = pageQuery.safeParse({ page: url.searchParams.get('page') ?? undefined });
	if (!paging.success) pageProblem(paging.error);
	const outbox = await listOutbox(database, actor, paging.data.page ?? 1, status).catch(
		pageProblem
	);
	return { outbox, status, catcherPort: mailCatcher?.port ?? null };
};
