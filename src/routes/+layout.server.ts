import { app } from '$lib/server/app/app';
import { decideService } from '$lib/server/access/permissions';
import type { LayoutServerLoad } from './$types';

/**
 * Every page knows who is signed in (or null), and whether the header may offer the archive.
 * No url dependency: it reruns after form actions (enhanced ones invalidate all, plain ones
 * reload), which is where one's own memberships change.
 */
export const load: LayoutServerLoad = async ({ locals }) => {
	// Anonymous pages stay off the database.
	if (!locals.user) return { user: null, mayReadArchive: false };
	const { database } = await app();
	const decision = await decideService(database, locals.actor, 'read-archive');
	return { user: locals.user, mayReadArchive: decision === 'allowed' };
};
