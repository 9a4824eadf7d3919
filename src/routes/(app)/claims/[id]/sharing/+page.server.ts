import { redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { requireSignedIn } from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { runFormAction } from '$lib/server/http/form-action';
import { getClaim } from '$lib/server/claims/claims';
import { releasedReports } from '$lib/server/review/reports';
import { listShares, shareClaim, withdrawShare } from '$lib/server/review/shares';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url, params }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	try {
		const claim = await getClaim(database, actor, params.id);
		const shares = await listShares(database, actor, params.id);
		const reports = await releasedReports(database, actor, params.id);
		return { claim, shares, reports };
	} catch (problem) {
		pageProblem(problem);
	}
};

const field = (form: FormData, key: string) => String(form.get(key) ?? '');

export const actions: Actions = {
	share: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const form = await event.request.formData();
		const values = {
			email: field(form, 'email'),
			journal: field(form, 'journal'),
			manuscript: field(form, 'manuscript')
		};
		return runFormAction(event, 'share', values, async () => {
			const { database } = await app();
			await shareClaim(database, actor, event.params.id, values);
			redirect(303, `/claims/${event.params.id}/sharing`);
		});
	},
	withdraw: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const shareId = field(await event.request.formData(), 'shareId');
		return runFormAction(event, 'withdraw', { shareId }, async () => {
			const { database } = await app();
			await withdrawShare(database, actor, shareId);
			redirect(303, `/claims/${event.params.id}/sharing`);
		});
	}
};
