import { redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { loginPath } from '$lib/server/http/auth-web';
import { groupsOf } from '$lib/server/accounts/groups';
import type { LayoutServerLoad } from './$types';

/**
 * Signed-in pages only. This guards page loads; every form action and endpoint below still
 * checks the user itself, because actions run without this load.
 */
export const load: LayoutServerLoad = async ({ locals, url }) => {
	if (locals.actor.kind !== 'user' || !locals.user) redirect(303, loginPath(url));
	const { database } = await app();
	return { user: locals.user, groups: await groupsOf(database, locals.actor) };
};
