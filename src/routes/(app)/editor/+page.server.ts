import { app } from '$lib/server/app/app';
import { requireSignedIn } from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { runFormAction } from '$lib/server/http/form-action';
import { editorHome } from '$lib/server/review/editor-home';
import { releaseReport } from '$lib/server/review/reports';
import { createReviewLink, revokeReviewLink } from '$lib/server/review/review-links';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	return { shared: await editorHome(database, actor).catch(pageProblem) };
};

const field = (form: FormData, key: string) => String(form.get(key) ?? '');

export const actions: Actions = {
	/** The new link's URL is shown once, here; only its hash is kept. */
	createLink: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const form = await event.request.formData();
		const claimId = field(form, 'claimId');
		const values = {
			claimId,
			label: field(form, 'label'),
			expiresInDays: field(form, 'expiresInDays')
		};
		return runFormAction(event, 'createLink', values, async () => {
			const { database } = await app();
			const { label, expiresInDays } = values;
			const link = await createReviewLink(database, actor, claimId, { label, expiresInDays });
			return { action: 'createLink', claimId, created: link };
		});
	},
	revokeLink: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const linkId = field(await event.request.formData(), 'linkId');
		return runFormAction(event, 'revokeLink', { linkId }, async () => {
			const { database } = await app();
			await revokeReviewLink(database, actor, linkId);
			return { action: 'revokeLink' };
		});
	},
	release: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const reportId = field(await event.request.formData(), 'reportId');
		return runFormAction(event, 'release', { reportId }, async () => {
			const { database } = await app();
			await releaseReport(database, actor, reportId);
			return { action: 'release' };
		});
	}
};
