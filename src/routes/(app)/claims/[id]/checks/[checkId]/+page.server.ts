import { error } from '@sveltejs/kit';
import { app } from '$lib/server/app';
import { requireSignedIn } from '$lib/server/auth-web';
import { pageProblem } from '$lib/server/problems';
import { getCheck } from '$lib/server/services/checks';
import { getClaim } from '$lib/server/services/claims';
import { getDataset } from '$lib/server/services/datasets';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	const [claim, check] = await Promise.all([
		getClaim(database, actor, params.id),
		getCheck(database, actor, params.checkId)
	]).catch(pageProblem);
	// A check reached through another claim's address is not found either, so ids do not leak.
	if (check.claimId !== claim.id) error(404, { message: 'No such check.', code: 'not_found' });
	const dataset = await getDataset(database, actor, check.datasetId).catch(pageProblem);
	return {
		claim,
		check,
		dataset: { id: dataset.id, originalName: dataset.originalName, sha256: dataset.sha256 }
	};
};
