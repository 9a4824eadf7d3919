/** zod schemas for the account, group and admin forms (the boundary; services re-check the rules). */
import { textRule } from '$lib/text-rules';
import { z } from 'zod';
import {
	EMAIL_MAX_LENGTH,
	NAME_MAX_LENGTH,
	PASSWORD_MAX_LENGTH,
	PASSWORD_MIN_LENGTH
} from '$lib/account-limits';

export const emailField = z
	.string('Enter your e-mail address.')
	.trim()
	.toLowerCase()
	.pipe(
		z.email('Enter a valid e-mail address.').max(EMAIL_MAX_LENGTH, 'This address is too long.')
	);

export const newPasswordField = z
	.string('Choose a password.')
	.min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
	.max(PASSWORD_MAX_LENGTH, `Use at most ${PASSWORD_MAX_LENGTH} characters.`);

export const signUpForm = z.object({
	name: z
		.string('Enter your name.')
		.trim()
		.min(1, 'Enter your name.')
		.max(NAME_MAX_LENGTH, `Use at most ${NAME_MAX_LENGTH} characters.`)
		.superRefine(textRule('Your name', 'line')),
	email: emailField,
	password: newPasswordField
});

export const signInForm = z.object({
	email: emailField,
	password: z.string('Enter your password.').min(1, 'Enter your password.').max(PASSWORD_MAX_LENGTH)
});

export const resetRequestForm = z.object({ email: emailField });

export const newPasswordForm = z
	.object({ password: newPasswordField, confirm: z.string('Repeat the password.') })
	.refine((f) => f.password === f.confirm, {
		path: ['confirm'],
		message: 'The two passwords differ.'
	});

export const groupNameForm = z.object({
	name: z
		.string('Name the group.')
		.trim()
		.min(2, 'Use 2 to 120 characters.')
		.max(120, 'Use 2 to 120 characters.')
		.superRefine(textRule('The group name', 'line'))
});

export const groupRoleField = z.enum(['lead', 'author'], 'Choose lead or author.');

export const inviteForm = z.object({ email: emailField, role: groupRoleField });

export const memberRoleForm = z.object({ userId: z.string().min(1), role: groupRoleField });

export const memberForm = z.object({ userId: z.string().min(1) });

export const invitationIdForm = z.object({ invitationId: z.string().min(1) });

export const accountRoleForm = z.object({
	userId: z.string().min(1),
	role: z.enum(['researcher', 'editor', 'admin'], 'Choose researcher, editor or admin.')
});

/** FormData as a plain object of its text fields, for schema.safeParse. */
export const formFields = (form: FormData): Record<string, string> =>
	Object.fromEntries(
		[...form].filter((entry): entry is [string, string] => typeof entry[1] === 'string')
	);
