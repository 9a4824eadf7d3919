import { error, fail, redirect } from '@sveltejs/kit';
import { app } from '$lib/server/app';
import { echoValues, fieldErrors, requireUser } from '$lib/server/auth-web';
import { ForbiddenError, NotFoundError } from '$lib/server/services/errors';
import {
	createToken,
	listTokens,
	mayIssueTokens,
	revokeToken,
	tokenNameSchema
} from '$lib/server/services/tokens';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const user = requireUser(locals, url);
	const { database } = await app();
	return {
		tokens: await listTokens(database, user.id),
		mayIssue: await mayIssueTokens(database, user.id),
		origin: url.origin
	};
};

export const actions: Actions = {
	create: async ({ request, locals, url }) => {
		const user = requireUser(locals, url);
		const form = await request.formData();
		const values = echoValues(form, ['name']);
		const parsed = tokenNameSchema.safeParse({ name: form.get('name') ?? '' });
		if (!parsed.success) return fail(400, { errors: fieldErrors(parsed.error), values });
		const { database } = await app();
		try {
			const created = await createToken(database, user.id, parsed.data.name);
			// The secret is in this one answer only; the list shows its prefix from now on.
			return { created: { id: created.id, name: created.name, token: created.token } };
		} catch (problem) {
			if (problem instanceof ForbiddenError)
				return fail(403, { errors: { '': problem.message }, values });
			throw problem;
		}
	},
	revoke: async ({ request, locals, url }) => {
		const user = requireUser(locals, url);
		const tokenId = String((await request.formData()).get('tokenId') ?? '');
		const { database } = await app();
		try {
			await revokeToken(database, user.id, tokenId);
		} catch (problem) {
			if (problem instanceof NotFoundError) error(404, problem.message);
			throw problem;
		}
		redirect(303, '/settings/tokens');
	}
};
