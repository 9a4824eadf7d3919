/**
 * Sign-in under the failure ladders (rate-limits.ts): one per (account, client address), one per
 * account from every address (a far higher ceiling, waived for an address the account signed in
 * from lately: sign-in-pauses.ts) and one per client address. The account is the address typed,
 * whether or not it has an account, so a pause says nothing about existence. A pause refuses
 * before the password is hashed; a success clears that address's ladder for the account.
 */
import type { Database } from '../db';
import { rateLimits, retryWords } from '../core/rate-limits';
import { normaliseEmail, signIn } from './accounts';
import { RateLimitedError } from '../core/errors';
import { isKnownAddress, pairKey, rememberAddress } from './sign-in-pauses';

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

/** Throws RateLimitedError when any ladder that applies is paused. */
async function refuseDuringPause(account: string, address: string): Promise<void> {
	const { signInAccountAddress, signInAccount, signInAddress } = rateLimits();
	const pairWait = await signInAccountAddress.check(pairKey(account, address));
	if (pairWait !== null) throw refuse(pairWait, 'for this account from your network address');
	const accountWait = await signInAccount.check(account);
	if (accountWait !== null && !(await isKnownAddress(account, address)))
		throw refuse(accountWait, 'for this account');
	const addressWait = await signInAddress.check(address);
	if (addressWait !== null) throw refuse(addressWait, 'from your network address');
}

/** Checks the password unless a pause is on; throws RateLimitedError during one. */
export async function signInFrom(
	database: Database,
	input: { email: string; password: string },
	client: { address: string }
): Promise<SignInOutcome> {
	const { signInAccountAddress, signInAccount, signInAddress } = rateLimits();
	const account = normaliseEmail(input.email);
	await refuseDuringPause(account, client.address);
	const found = await signIn(database, account, input.password);
	if (found) {
		await signInAccountAddress.clear(pairKey(account, client.address));
		await rememberAddress(account, client.address);
		return { userId: found.userId, pauseSeconds: null };
	}
	const known = await isKnownAddress(account, client.address);
	const pauses = await Promise.all([
		signInAccountAddress.fail(pairKey(account, client.address)),
		signInAccount.fail(account).then((pause) => (known ? null : pause)),
		signInAddress.fail(client.address)
	]);
	const started = pauses.filter((s): s is number => s !== null);
	return { userId: null, pauseSeconds: started.length ? Math.max(...started) : null };
}
