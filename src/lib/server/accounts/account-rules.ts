/** Rules every account path shares: how addresses are kept and how long a password may be. */
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from '$lib/account-limits';
import { FieldError } from '../core/field-error';

export { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH };

export const normaliseEmail = (email: string): string => email.trim().toLowerCase();

export function checkPassword(password: string, field = 'password') {
	if (password.length < PASSWORD_MIN_LENGTH) {
		throw new FieldError(field, `Use at least ${PASSWORD_MIN_LENGTH} characters.`);
	}
	if (password.length > PASSWORD_MAX_LENGTH) {
		throw new FieldError(field, `Use at most ${PASSWORD_MAX_LENGTH} characters.`);
	}
}

export const EMAIL_TAKEN =
	'An account with this address already exists. Sign in, or ask for a new password.';
