import { redirect } from '@sveltejs/kit';
import { formFields, groupNameForm } from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { formFailure } from '$lib/server/http/problems';
import { createGroup } from '$lib/server/accounts/groups';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url }) => ({ verified: url.searchParams.has('verified') });

export const actions: Actions = {
	create: async ({ locals, request, url }) => {
		const actor = requireSignedIn(locals, url);
		const form = await request.formData();
		const values = echoValues(form, ['name']);
		const parsed = groupNameForm.safeParse(formFields(form));
		if (!parsed.success) return formFailure('create', parsed.error, values);
		const { database } = await app();
		let groupId: string;
		try {
			({ id: groupId } = await createGroup(database, actor, parsed.data.name));
		} catch (problem) {
			return formFailure('create', problem, values);
		}
		redirect(303, `/group/${groupId}`);
	}
};
