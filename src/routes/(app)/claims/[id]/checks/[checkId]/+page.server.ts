import { error } from '@sveltejs/kit';
import { app } from '$lib/server/app';
import { requireUser } from '$lib/server/auth-web';
import { getCheck } from '$lib/server/services/checks';
import { getClaim } from '$lib/server/services/claims';
import { getDataset } from '$lib/server/services/datasets';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const user = requireUser(locals, url);
	const { database } = await app();
	const [claim, check] = await Promise.all([
		getClaim(database, user.id, params.id),
		getCheck(database, user.id, params.checkId)
	]);
	// A check reached through another claim's address is not found either, so ids do not leak.
	if (!claim || !check || check.claimId !== claim.id) error(404, 'No such check.');
	const dataset = await getDataset(database, user.id, check.datasetId);
	return {
		claim,
		check,
		dataset: dataset && {
			id: dataset.id,
			originalName: dataset.originalName,
			sha256: dataset.sha256
		}
	};
};
