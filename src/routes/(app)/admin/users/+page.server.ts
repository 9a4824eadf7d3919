import { fail, redirect } from '@sveltejs/kit';
import { accountRoleForm, formFields } from '$lib/server/account-forms';
import { app } from '$lib/server/app';
import { fieldErrors, requireUser, serviceProblem } from '$lib/server/auth-web';
import { listUsers, setAccountRole } from '$lib/server/services/account-roles';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const user = requireUser(locals, url);
	const { database } = await app();
	try {
		return { users: await listUsers(database, user.id) };
	} catch (problem) {
		serviceProblem(problem);
		throw problem;
	}
};

export const actions: Actions = {
	role: async ({ locals, request, url }) => {
		const user = requireUser(locals, url);
		const parsed = accountRoleForm.safeParse(formFields(await request.formData()));
		if (!parsed.success) return fail(400, { errors: fieldErrors(parsed.error), userId: null });
		const { database } = await app();
		try {
			await setAccountRole(database, user.id, parsed.data.userId, parsed.data.role);
		} catch (problem) {
			return fail(400, { errors: serviceProblem(problem), userId: parsed.data.userId });
		}
		redirect(303, '/admin/users');
	}
};
