import { redirect } from '@sveltejs/kit';
import { formFields, groupNameForm } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { runFormAction } from '$lib/server/http/form-action';
import { createGroup } from '$lib/server/accounts/groups';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url }) => ({ verified: url.searchParams.has('verified') });

export const actions: Actions = {
	create: async (event) => {
		const actor = requireSignedIn(event.locals, event.url);
		const form = await event.request.formData();
		const values = echoValues(form, ['name']);
		return runFormAction(event, 'create', values, async () => {
			const { name } = groupNameForm.parse(formFields(form));
			const { database } = await app();
			const { id } = await createGroup(database, actor, name);
			redirect(303, `/group/${id}`);
		});
	}
};
