import { error, redirect } from '@sveltejs/kit';
import { isTrialsResult } from '$lib/certify/trials';
import { reproduceCommand } from '$lib/evidence/command-line';
import { isTargetResult } from '$lib/certify/fidelity-target';
import { targetCommand } from '$lib/evidence/target-command';
import { app } from '$lib/server/app/app';
import { requireSignedIn } from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { runFormAction } from '$lib/server/http/form-action';
import { listCertificates, mayIssueCertificate } from '$lib/server/certificates/certificate-reads';
import { issueCertificate } from '$lib/server/certificates/certificates';
import { cancelCheck, getCheck, mayCancelCheck } from '$lib/server/checks/checks';
import { getClaim } from '$lib/server/claims/claims';
import { getDataset } from '$lib/server/datasets/datasets';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	const [claim, check] = await Promise.all([
		getClaim(database, actor, params.id),
		getCheck(database, actor, params.checkId)
	]).catch(pageProblem);
	// A check reached through another claim's address is not found either, so ids do not leak.
	if (check.claimId !== claim.id) error(404, { message: 'No such check.', code: 'not_found' });
	const [dataset, certificates, mayIssue, mayCancel] = await Promise.all([
		getDataset(database, actor, check.datasetId),
		listCertificates(database, actor, claim.id),
		mayIssueCertificate(database, actor, claim.id),
		mayCancelCheck(database, actor, check.id)
	]).catch(pageProblem);
	// Time-ordered trials have no reproduce command of the counts kind (their certificate does).
	const trials = isTrialsResult(check.result);
	return {
		claim,
		check,
		dataset: { id: dataset.id, originalName: dataset.originalName, sha256: dataset.sha256 },
		command: isTargetResult(check.result)
			? targetCommand(check.result, dataset.originalName)
			: check.result && !trials
				? reproduceCommand(check.result, dataset.originalName)
				: null,
		certificates: certificates.filter((c) => c.checkId === check.id),
		mayIssue: mayIssue && check.status === 'done' && !check.byReferee,
		mayCancel
	};
};

export const actions: Actions = {
	/** Issues a signed certificate for this finished check, then shows it. */
	issue: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const { id, checkId } = event.params;
		return runFormAction(event, 'issue', {}, async () => {
			const { database } = await app();
			const certificate = await issueCertificate(database, actor, id, checkId);
			redirect(303, `/claims/${id}/certificates/${certificate.id}`);
		});
	},

	/** Cancels this check while it is queued or running; 409 beside the button once it has ended. */
	cancel: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const { id, checkId } = event.params;
		return runFormAction(event, 'cancel', {}, async () => {
			const { database } = await app();
			const check = await getCheck(database, actor, checkId);
			if (check.claimId !== id) error(404, { message: 'No such check.', code: 'not_found' });
			await cancelCheck(database, actor, check.id);
			redirect(303, `/claims/${id}/checks/${checkId}`);
		});
	}
};
