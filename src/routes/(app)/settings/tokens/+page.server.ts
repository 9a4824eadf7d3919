import { redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { formFailure } from '$lib/server/http/problems';
import {
	createToken,
	listTokens,
	mayIssueTokens,
	revokeToken,
	TOKEN_DEFAULT_DAYS,
	tokenInputSchema
} from '$lib/server/accounts/tokens';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	return {
		tokens: await listTokens(database, actor),
		mayIssue: await mayIssueTokens(database, actor),
		defaultDays: TOKEN_DEFAULT_DAYS,
		origin: url.origin
	};
};

export const actions: Actions = {
	create: async ({ request, locals, url }) => {
		const actor = requireSignedIn(locals, url);
		const form = await request.formData();
		const values = echoValues(form, ['name', 'expiresInDays']);
		const parsed = tokenInputSchema.safeParse(values);
		if (!parsed.success) return formFailure('create', parsed.error, values);
		const { database } = await app();
		try {
			const created = await createToken(database, actor, parsed.data);
			// The secret is in this one answer only; the list shows its prefix from now on.
			return { created: { id: created.id, name: created.name, token: created.token } };
		} catch (problem) {
			return formFailure('create', problem, values);
		}
	},
	revoke: async ({ request, locals, url }) => {
		const actor = requireSignedIn(locals, url);
		const tokenId = String((await request.formData()).get('tokenId') ?? '');
		const { database } = await app();
		try {
			await revokeToken(database, actor, tokenId);
		} catch (problem) {
			return formFailure('revoke', problem);
		}
		redirect(303, '/settings/tokens');
	}
};
