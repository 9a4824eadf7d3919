import { app } from '$lib/server/app/app';
import { requireSignedIn } from '$lib/server/http/auth-web';
import { formFailure, pageProblem } from '$lib/server/http/problems';
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
	createLink: async ({ locals, request, url }) => {
		const actor = requireSignedIn(locals, url);
		const form = await request.formData();
		const claimId = field(form, 'claimId');
		const values = {
			claimId,
			label: field(form, 'label'),
			expiresInDays: field(form, 'expiresInDays')
		};
		const { database } = await app();
		try {
			const { label, expiresInDays } = values;
			const link = await createReviewLink(database, actor, claimId, { label, expiresInDays });
			return { action: 'createLink', claimId, created: link };
		} catch (problem) {
			return formFailure('createLink', problem, values);
		}
	},
	revokeLink: async ({ locals, request, url }) => {
		const actor = requireSignedIn(locals, url);
		const linkId = field(await request.formData(), 'linkId');
		const { database } = await app();
		try {
			await revokeReviewLink(database, actor, linkId);
		} catch (problem) {
			return formFailure('revokeLink', problem, { linkId });
		}
		return { action: 'revokeLink' };
	},
	release: async ({ locals, request, url }) => {
		const actor = requireSignedIn(locals, url);
		const reportId = field(await request.formData(), 'reportId');
		const { database, mailer } = await app();
		try {
			await releaseReport(database, mailer, actor, reportId);
		} catch (problem) {
			return formFailure('release', problem, { reportId });
		}
		return { action: 'release' };
	}
};
