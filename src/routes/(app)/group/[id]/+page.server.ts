import { redirect } from '@sveltejs/kit';
import type { z } from 'zod';
import {
	formFields,
	invitationIdForm,
	inviteForm,
	memberForm,
	memberRoleForm
} from '$lib/server/accounts/account-forms';
import { app } from '$lib/server/app/app';
import { type Actor } from '$lib/server/core/actor';
import { echoValues, requireSignedIn } from '$lib/server/http/auth-web';
import { pageProblem } from '$lib/server/http/problems';
import { byteWords, groupStorage } from '$lib/server/accounts/group-storage';
import { changeMemberRole, getGroup, removeMember } from '$lib/server/accounts/groups';
import { runFormAction } from '$lib/server/http/form-action';
import { inviteMember, listInvitations, revokeInvitation } from '$lib/server/accounts/invitations';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const actor = requireSignedIn(locals, url);
	const { database } = await app();
	try {
		const group = await getGroup(database, actor, params.id);
		const lead = group.role === 'lead';
		const invitations = lead ? await listInvitations(database, actor, params.id) : [];
		// Only leads see how much of the quota the group's counts files take.
		const storage = lead ? await groupStorage(database, actor, params.id) : null;
		const words = storage && {
			used: byteWords(storage.usedBytes),
			quota: byteWords(storage.quotaBytes)
		};
		return {
			group,
			invitations,
			invited: url.searchParams.get('invited'),
			storage: storage && { ...storage, ...words }
		};
	} catch (problem) {
		pageProblem(problem);
	}
};

/**
 * Runs one member-management action: parse the form, call the service (which re-checks that the
 * caller leads this group), and answer the failure beside the form or 303 back to the page.
 */
async function act<S extends z.ZodType<Record<string, string>>>(
	event: RequestEvent,
	action: string,
	schema: S,
	run: (actor: Actor, input: z.output<S>) => Promise<string | void>
) {
	const actor = requireSignedIn(event.locals, event.url);
	const form = await event.request.formData();
	const values = echoValues(form, ['email', 'role', 'userId']);
	return runFormAction(event, action, values, async () => {
		const next = await run(actor, schema.parse(formFields(form)));
		redirect(303, next ?? `/group/${event.params.id}`);
	});
}

export const actions: Actions = {
	invite: (event) =>
		act(event, 'invite', inviteForm, async (actor, input) => {
			const { database } = await app();
			await inviteMember(database, actor, event.params.id, input);
			return `/group/${event.params.id}?invited=${encodeURIComponent(input.email)}`;
		}),
	revoke: (event) =>
		act(event, 'revoke', invitationIdForm, async (actor, input) => {
			const { database } = await app();
			await revokeInvitation(database, actor, event.params.id, input.invitationId);
		}),
	role: (event) =>
		act(event, 'role', memberRoleForm, async (actor, input) => {
			const { database } = await app();
			await changeMemberRole(database, actor, event.params.id, input.userId, input.role);
		}),
	remove: (event) =>
		act(event, 'remove', memberForm, async (actor, input) => {
			const { database } = await app();
			await removeMember(database, actor, event.params.id, input.userId);
			// Leads may remove themselves (while another lead remains); they then leave the page.
			if (actor.kind === 'user' && input.userId === actor.userId) return '/group';
		})
};
