import { error, fail, redirect } from '@sveltejs/kit';
import { claimInputSchema } from '$lib/claims/schema';
import { app } from '$lib/server/app';
import { echoValues, fieldErrors, requireUser } from '$lib/server/auth-web';
import { updateClaim } from '$lib/server/services/claim-edit';
import { listChecks } from '$lib/server/services/checks';
import { getClaim } from '$lib/server/services/claims';
import { ConflictError, ForbiddenError, NotFoundError } from '$lib/server/services/errors';
import { FieldError } from '$lib/server/services/field-error';
import type { Actions, PageServerLoad } from './$types';

const FIELDS = [
	'title',
	'sourceDescription',
	'dimension',
	'method',
	'bases',
	'claimedSchmidtNumber',
	'manuscriptReference'
];

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const user = requireUser(locals, url);
	const { database } = await app();
	const claim = await getClaim(database, user.id, params.id);
	if (!claim) error(404, 'No such claim.');
	const checked = (await listChecks(database, user.id, claim.id)).length > 0;
	const values = {
		title: claim.title,
		sourceDescription: claim.sourceDescription,
		dimension: String(claim.dimension),
		method: claim.method,
		bases: claim.bases.join(','),
		claimedSchmidtNumber: String(claim.claimedSchmidtNumber),
		manuscriptReference: claim.manuscriptReference ?? ''
	};
	return { claim: { id: claim.id, title: claim.title }, checked, values };
};

export const actions: Actions = {
	save: async ({ request, locals, params, url }) => {
		const user = requireUser(locals, url);
		const values = echoValues(await request.formData(), FIELDS);
		const parsed = claimInputSchema.safeParse(values);
		if (!parsed.success) return fail(400, { errors: fieldErrors(parsed.error), values });
		const { database } = await app();
		try {
			await updateClaim(database, user.id, params.id, parsed.data);
		} catch (problem) {
			if (problem instanceof FieldError)
				return fail(400, { errors: { [problem.field]: problem.message }, values });
			if (problem instanceof ConflictError || problem instanceof ForbiddenError)
				return fail(problem instanceof ConflictError ? 409 : 403, {
					errors: { '': problem.message },
					values
				});
			if (problem instanceof NotFoundError) error(404, problem.message);
			throw problem;
		}
		redirect(303, `/claims/${params.id}`);
	}
};
