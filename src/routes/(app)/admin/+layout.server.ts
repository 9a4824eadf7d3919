import { requireService } from '$lib/server/access/permissions';
import { app } from '$lib/server/app';
import { pageProblem } from '$lib/server/problems';
import type { LayoutServerLoad } from './$types';

/** Admin pages: page loads stop here; each load and action also asks the service, which re-checks. */
export const load: LayoutServerLoad = async ({ locals }) => {
	const { database } = await app();
	await requireService(database, locals.actor, 'manage-accounts').catch(pageProblem);
	return {};
};
