import { redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { requireSignedIn } from '$lib/server/http/auth-web';
import { formFailure, pageProblem } from '$lib/server/http/problems';
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
	share: async ({ locals, request, url, params }) => {
		const actor = requireSignedIn(locals, url);
		const form = await request.formData();
		const values = {
			email: field(form, 'email'),
			journal: field(form, 'journal'),
			manuscript: field(form, 'manuscript')
		};
		const { database, mailer } = await app();
		try {
			await shareClaim(database, mailer, actor, params.id, values);
		} catch (problem) {
			return formFailure('share', problem, values);
		}
		redirect(303, `/claims/${params.id}/sharing`);
	},
	withdraw: async ({ locals, request, url, params }) => {
		const actor = requireSignedIn(locals, url);
		const shareId = field(await request.formData(), 'shareId');
		const { database } = await app();
		try {
			await withdrawShare(database, actor, shareId);
		} catch (problem) {
			return formFailure('withdraw', problem, { shareId });
		}
		redirect(303, `/claims/${params.id}/sharing`);
	}
};
