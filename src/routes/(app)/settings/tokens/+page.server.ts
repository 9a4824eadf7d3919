import { redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { runFormAction } from '$lib/server/http/form-action';
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
	create: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const values = echoValues(await event.request.formData(), ['name', 'expiresInDays']);
		return runFormAction(event, 'create', values, async () => {
			const input = tokenInputSchema.parse(values);
			const { database } = await app();
			const created = await createToken(database, actor, input);
			// The secret is in this one answer only; the list shows its prefix from now on.
			return { created: { id: created.id, name: created.name, token: created.token } };
		});
	},
	revoke: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const tokenId = String((await event.request.formData()).get('tokenId') ?? '');
		return runFormAction(event, 'revoke', {}, async () => {
			const { database } = await app();
			await revokeToken(database, actor, tokenId);
			redirect(303, '/settings/tokens');
		});
	}
};
