import { redirect } from '@sveltejs/kit';
import { accountRoleForm, formFields } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { runFormAction } from '$lib/server/http/form-action';
import { listUsers, setAccountRole } from '$lib/server/accounts/account-roles';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	return { users: await listUsers(database, actor).catch(pageProblem) };
};

export const actions: Actions = {
	role: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const form = await event.request.formData();
		const values = echoValues(form, ['userId', 'role']);
		return runFormAction(event, 'role', values, async () => {
			const { userId, role } = accountRoleForm.parse(formFields(form));
			const { database } = await app();
			await setAccountRole(database, actor, userId, role);
			redirect(303, '/admin/users');
		});
	}
};
