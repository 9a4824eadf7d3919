import { error, redirect } from '@sveltejs/kit';
import { isTrialsResult } from '$lib/certify/trials';
import { reproduceCommand } from '$lib/evidence/command-line';
import { isTargetResult } from '$lib/certify/fidelity-target';
import { targetCommand } from '$lib/evidence/target-command';
import { app } from '$lib/server/app';
import { requireSignedIn } from '$lib/server/auth-web';
import { formFailure, pageProblem } from '$lib/server/problems';
import { listCertificates, mayIssueCertificate } from '$lib/server/services/certificate-reads';
import { issueCertificate } from '$lib/server/services/certificates';
import { cancelCheck, getCheck, mayCancelCheck } from '$lib/server/services/checks';
import { getClaim } from '$lib/server/services/claims';
import { getDataset } from '$lib/server/services/datasets';
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
	// Certificates from time-ordered trials are not built yet (issue 20, slice 2).
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
		mayIssue: mayIssue && check.status === 'done' && !check.byReferee && !trials,
		mayCancel
	};
};

export const actions: Actions = {
	/** Issues a signed certificate for this finished check, then shows it. */
	issue: async ({ locals, params, url }) => {
		const actor = requireSignedIn(locals, url);
		const { database } = await app();
		let certificateId: string;
		try {
			certificateId = (await issueCertificate(database, actor, params.id, params.checkId)).id;
		} catch (problem) {
			return formFailure('issue', problem);
		}
		redirect(303, `/claims/${params.id}/certificates/${certificateId}`);
	},

	/** Cancels this check while it is queued or running; 409 beside the button once it has ended. */
	cancel: async ({ locals, params, url }) => {
		const actor = requireSignedIn(locals, url);
		const { database } = await app();
		try {
			const check = await getCheck(database, actor, params.checkId);
			if (check.claimId !== params.id) error(404, { message: 'No such check.', code: 'not_found' });
			await cancelCheck(database, actor, check.id);
		} catch (problem) {
			return formFailure('cancel', problem);
		}
		redirect(303, `/claims/${params.id}/checks/${params.checkId}`);
	}
};
