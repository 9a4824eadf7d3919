import { error, redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import {} from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { runFormAction } from '$lib/server/http/form-action';
import { INVALID_REVIEW_LINK } from '$lib/server/http/review-api';
import {
	cancellableReRuns,
	cancelRefereeCheck,
	refereeView,
	startRefereeCheck
} from '$lib/server/review/referee';
import { saveReport } from '$lib/server/review/reports';
import type { Actions, PageServerLoad } from './$types';

/** Only the link decides: a signed-in session is ignored here (see review-handle.ts). */
function referee(locals: App.Locals) {
	const refusal = locals.refusal;
	if (refusal) error(429, { message: refusal.message, code: 'rate_limited' });
	if (locals.actor.kind !== 'referee')
		error(404, { message: INVALID_REVIEW_LINK, code: 'invalid_review_link' });
	return locals.actor;
}

export const load: PageServerLoad = async ({ locals, params }) => {
	const actor = referee(locals);
	const { database } = await app();
	const view = await refereeView(database, actor).catch(pageProblem);
	const cancellable = await cancellableReRuns(database, actor, view.checks);
	return { ...view, cancellable, token: params.token };
};

const text = (form: FormData, key: string) => String(form.get(key) ?? '');

export const actions: Actions = {
	rerun: async (event) => {
		const actor = referee(event.locals);
		const seed = text(await event.request.formData(), 'seed').trim();
		return runFormAction(event, 'rerun', { seed }, async () => {
			const { database } = await app();
			await startRefereeCheck(database, actor, { seed: seed || undefined });
			redirect(303, `${event.url.pathname}#reruns`);
		});
	},
	/** Cancels one of this link's queued or running re-runs; 409 beside it once it has ended. */
	cancel: async (event) => {
		const actor = referee(event.locals);
		const checkId = text(await event.request.formData(), 'checkId');
		return runFormAction(event, 'cancel', { checkId }, async () => {
			const { database } = await app();
			await cancelRefereeCheck(database, actor, checkId);
			redirect(303, `${event.url.pathname}#reruns`);
		});
	},
	report: async (event) => {
		const actor = referee(event.locals);
		const form = await event.request.formData();
		const values = {
			recommendation: text(form, 'recommendation'),
			comments: text(form, 'comments')
		};
		const submit = form.get('intent') === 'file';
		return runFormAction(event, 'report', values, async () => {
			const { database } = await app();
			await saveReport(database, actor, { ...values, submit });
			redirect(303, `${event.url.pathname}#report`);
		});
	}
};
