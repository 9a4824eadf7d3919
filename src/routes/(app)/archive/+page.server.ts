import { redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { archiveFilterSchema } from '$lib/archive/schema';
import { app } from '$lib/server/app/app';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { fieldErrors, pageProblem } from '$lib/server/http/problems';
import { withdrawReasonField } from '$lib/claims/withdrawal';
import { runFormAction } from '$lib/server/http/form-action';
import { groupArchive } from '$lib/server/claims/archive';
import { withdrawClaim } from '$lib/server/claims/claim-withdraw';
import { groupsOf } from '$lib/server/accounts/groups';
import type { Actions, PageServerLoad } from './$types';

const FILTER_KEYS = ['group', 'q', 'state', 'method', 'dimension', 'from', 'to'] as const;

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	const groups = await groupsOf(database, actor);
	const values = Object.fromEntries(FILTER_KEYS.map((k) => [k, url.searchParams.get(k) ?? '']));
	const parsed = archiveFilterSchema.safeParse(values);
	// A bad filter is shown beside its field; the archive then shows unfiltered.
	const errors = parsed.success ? {} : fieldErrors(parsed.error);
	const filter = parsed.success ? parsed.data : { group: values.group || undefined };
	const archive = await groupArchive(database, actor, filter).catch(pageProblem);
	return { groups, values, errors, archive };
};

const withdrawForm = z.object({
	claimId: z.string().min(1).max(100),
	reason: withdrawReasonField
});

export const actions: Actions = {
	withdraw: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const values = echoValues(await event.request.formData(), ['claimId', 'reason']);
		return runFormAction(event, 'withdraw', values, async () => {
			const { claimId, reason } = withdrawForm.parse(values);
			const { database } = await app();
			await withdrawClaim(database, actor, claimId, reason);
			redirect(303, `/archive${event.url.search}`);
		});
	}
};
