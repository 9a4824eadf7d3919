import { redirect } from '@sveltejs/kit';
import { accountRoleForm, formFields } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { formFailure, pageProblem } from '$lib/server/http/problems';
import { listUsers, setAccountRole } from '$lib/server/accounts/account-roles';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	return { users: await listUsers(database, actor).catch(pageProblem) };
};

export const actions: Actions = {
	role: async ({ locals, request, url }) => {
		const actor = requireSignedIn(locals, url);
		const form = await request.formData();
		const values = echoValues(form, ['userId', 'role']);
		const parsed = accountRoleForm.safeParse(formFields(form));
		if (!parsed.success) return formFailure('role', parsed.error, values);
		const { database } = await app();
		try {
			await setAccountRole(database, actor, parsed.data.userId, parsed.data.role);
		} catch (problem) {
			return formFailure('role', problem, values);
		}
		redirect(303, '/admin/users');
	}
};
