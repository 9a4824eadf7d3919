import { fail, redirect } from '@sveltejs/kit';
import type { z } from 'zod';
import {
	formFields,
	invitationIdForm,
	inviteForm,
	memberForm,
	memberRoleForm
} from '$lib/server/account-forms';
import { app } from '$lib/server/app';
import { echoValues, fieldErrors, requireUser, serviceProblem } from '$lib/server/auth-web';
import { changeMemberRole, getGroup, removeMember } from '$lib/server/services/groups';
import { inviteMember, listInvitations, revokeInvitation } from '$lib/server/services/invitations';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const user = requireUser(locals, url);
	const { database } = await app();
	try {
		const group = await getGroup(database, user.id, params.id);
		const invitations =
			group.role === 'lead' ? await listInvitations(database, user.id, params.id) : [];
		return { group, invitations, invited: url.searchParams.get('invited') };
	} catch (problem) {
		serviceProblem(problem);
		throw problem;
	}
};

/**
 * Runs one member-management action: parse the form, call the service (which re-checks that the
 * user leads this group), and answer fail(400) beside the form or 303 back to the page.
 */
async function act<S extends z.ZodType<Record<string, string>>>(
	event: RequestEvent,
	action: string,
	schema: S,
	run: (userId: string, input: z.output<S>) => Promise<string | void>
) {
	const user = requireUser(event.locals, event.url);
	const form = await event.request.formData();
	const values = echoValues(form, ['email', 'role', 'userId']);
	const parsed = schema.safeParse(formFields(form));
	if (!parsed.success) return fail(400, { action, errors: fieldErrors(parsed.error), values });
	let next: string | void;
	try {
		next = await run(user.id, parsed.data);
	} catch (problem) {
		return fail(400, { action, errors: serviceProblem(problem), values });
	}
	redirect(303, next ?? `/group/${event.params.id}`);
}

export const actions: Actions = {
	invite: (event) =>
		act(event, 'invite', inviteForm, async (userId, input) => {
			const { database, mailer } = await app();
			await inviteMember(database, mailer, userId, event.params.id, input);
			return `/group/${event.params.id}?invited=${encodeURIComponent(input.email)}`;
		}),
	revoke: (event) =>
		act(event, 'revoke', invitationIdForm, async (userId, input) => {
			const { database } = await app();
			await revokeInvitation(database, userId, event.params.id, input.invitationId);
		}),
	role: (event) =>
		act(event, 'role', memberRoleForm, async (userId, input) => {
			const { database } = await app();
			await changeMemberRole(database, userId, event.params.id, input.userId, input.role);
		}),
	remove: (event) =>
		act(event, 'remove', memberForm, async (userId, input) => {
			const { database } = await app();
			await removeMember(database, userId, event.params.id, input.userId);
			// Leads may remove themselves (while another lead remains); they then leave the page.
			if (input.userId === userId) return '/group';
		})
};
