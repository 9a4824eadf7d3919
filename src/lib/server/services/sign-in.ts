/**
 * Sign-in under the failure ladders (rate-limits.ts): one per account (the address typed, whether
 * or not it has an account, so a pause says nothing about existence) and one per client address.
 * A pause refuses before the password is hashed; a success clears the account's failures.
 */
import type { Database } from '../db';
import { rateLimits, retryWords } from '../rate-limits';
import { normaliseEmail, signIn } from './accounts';
import { RateLimitedError } from './errors';

export interface SignInOutcome {
	userId: string | null;
	/** Seconds before the next try may go ahead, when this failure started a pause. */
	pauseSeconds: number | null;
}

const refuse = (seconds: number, whose: string) =>
	new RateLimitedError(
		`Too many failed sign-ins ${whose}. Try again ${retryWords(seconds)}.`,
		seconds
	);

/** Checks the password unless a pause is on; throws RateLimitedError during one. */
export async function signInFrom(
	database: Database,
	input: { email: string; password: string },
	client: { address: string }
): Promise<SignInOutcome> {
	const { signInAccount, signInAddress } = rateLimits();
	const account = normaliseEmail(input.email);
	const accountWait = await signInAccount.check(account);
	if (accountWait !== null) throw refuse(accountWait, 'for this account');
	const addressWait = await signInAddress.check(client.address);
	if (addressWait !== null) throw refuse(addressWait, 'from your network address');
	const found = await signIn(database, account, input.password);
	if (found) {
		await signInAccount.clear(account);
		return { userId: found.userId, pauseSeconds: null };
	}
	const [byAccount, byAddress] = await Promise.all([
		signInAccount.fail(account),
		signInAddress.fail(client.address)
	]);
	const pauses = [byAccount, byAddress].filter((s): s is number => s !== null);
	return { userId: null, pauseSeconds: pauses.length ? Math.max(...pauses) : null };
}
