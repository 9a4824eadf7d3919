import { error, redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { formRefusal } from '$lib/server/http/auth-web';
import { formFailure, pageProblem } from '$lib/server/http/problems';
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
	rerun: async ({ locals, request, url, setHeaders }) => {
		const actor = referee(locals);
		const form = await request.formData();
		const seed = text(form, 'seed').trim();
		const { database } = await app();
		try {
			await startRefereeCheck(database, actor, { seed: seed || undefined });
		} catch (problem) {
			return formRefusal({ setHeaders }, 'rerun', problem, { seed });
		}
		redirect(303, `${url.pathname}#reruns`);
	},
	/** Cancels one of this link's queued or running re-runs; 409 beside it once it has ended. */
	cancel: async ({ locals, request, url }) => {
		const actor = referee(locals);
		const checkId = text(await request.formData(), 'checkId');
		const { database } = await app();
		try {
			await cancelRefereeCheck(database, actor, checkId);
		} catch (problem) {
			return formFailure('cancel', problem, { checkId });
		}
		redirect(303, `${url.pathname}#reruns`);
	},
	report: async ({ locals, request, url }) => {
		const actor = referee(locals);
		const form = await request.formData();
		const values = {
			recommendation: text(form, 'recommendation'),
			comments: text(form, 'comments')
		};
		const submit = form.get('intent') === 'file';
		const { database, mailer } = await app();
		try {
			await saveReport(database, mailer, actor, { ...values, submit });
		} catch (problem) {
			return formFailure('report', problem, values);
		}
		redirect(303, `${url.pathname}#report`);
	}
};
