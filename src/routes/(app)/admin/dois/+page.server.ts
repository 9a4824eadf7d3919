import { redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { pageField } from '$lib/paging';
import { requireService } from '$lib/server/access/permissions';
import { app } from '$lib/server/app/app';
import { listDoiRegistrations, retryDoiNow } from '$lib/server/certificates/doi-admin';
import { config } from '$lib/server/core/config';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { runFormAction } from '$lib/server/http/form-action';
import { pageProblem } from '$lib/server/http/problems';
import type { Actions, PageServerLoad } from './$types';

const statusFilter = z
	.enum(['queued', 'sending', 'retrying', 'failed', 'done'])
	.nullable()
	.catch(null);
const pageQuery = z.object({ page: pageField() });
const retryForm = z.object({
	certificateId: z
		.string({ message: 'Name the certificate.' })
		.trim()
		.min(1, 'Name the certificate.')
});

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database, doiRunner } = await app();
	const status = statusFilter.parse(url.searchParams.get('status'));
	const paging = pageQuery.safeParse({ page: url.searchParams.get('page') ?? undefined });
	if (!paging.success) pageProblem(paging.error);
	const registrations = await listDoiRegistrations(
		database,
		actor,
		paging.data.page ?? 1,
		status
	).catch(pageProblem);
	// Without DATACITE_URL the DOIs go to the local fake registry, and the page says so.
	const fake = doiRunner.fakeRegistry;
	const registry = { fake: fake !== null, address: fake?.url ?? config().datacite.url };
	return { registrations, status, registry };
};

export const actions: Actions = {
	retry: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const form = await event.request.formData();
		const values = echoValues(form, ['certificateId']);
		return runFormAction(event, 'retry', values, async () => {
			const { database } = await app();
			// Who asks comes before what they sent: a non-admin hears 403 whatever the form holds.
			await requireService(database, actor, 'retry-doi');
			const { certificateId } = retryForm.parse(Object.fromEntries(form));
			// The sender is woken when the change commits (onDoiQueued).
			await retryDoiNow(database, actor, certificateId);
			redirect(303, '/admin/dois');
		});
	}
};
