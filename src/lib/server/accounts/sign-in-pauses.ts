/**
 * What the sign-in ladders are keyed on, and what a password reset forgets. The pause a person
 * meets is per (account, client address), so guesses from elsewhere never pause the owner; the
 * account-wide ceiling is waived for an address the account signed in from in the last 14 days.
 * A completed reset starts the account's pauses afresh: its ceiling is cleared and every
 * (account, address) ladder is left behind by moving the account to a new generation.
 */
import { RateLimiterMemory } from 'rate-limiter-flexible';
import { rateLimits } from '../core/rate-limits';

/** Under 24.8 days: the memory store's expiry is a setTimeout, which overflows past 2³¹ ms. */
export const KNOWN_ADDRESS_DAYS = 14;

interface PauseState {
	generations: Map<string, number>;
	knownAddresses: RateLimiterMemory;
}

/** Kept beside the process's limits, so resetRateLimits() (tests) forgets it too. */
const states = new WeakMap<object, PauseState>();
function state(): PauseState {
	const limits = rateLimits();
	let found = states.get(limits);
	if (!found) {
		const duration = KNOWN_ADDRESS_DAYS * 86400;
		found = {
			generations: new Map(),
			knownAddresses: new RateLimiterMemory({ points: 1, duration })
		};
		states.set(limits, found);
	}
	return found;
}

/** The key of one account from one client address, in the account's current generation. */
export function pairKey(account: string, address: string): string {
	return `${account}\n${state().generations.get(account) ?? 0}\n${address}`;
}

/** Whether this account signed in successfully from this address lately. */
export async function isKnownAddress(account: string, address: string): Promise<boolean> {
	const seen = await state().knownAddresses.get(`${account}\n${address}`);
	return seen !== null && seen.msBeforeNext > 0;
}

export async function rememberAddress(account: string, address: string): Promise<void> {
	await state().knownAddresses.set(`${account}\n${address}`, 1, KNOWN_ADDRESS_DAYS * 86400);
}

/** After a completed password reset (account as normaliseEmail gives it): no pause survives. */
export async function clearSignInPauses(account: string): Promise<void> {
	const { generations } = state();
	generations.set(account, (generations.get(account) ?? 0) + 1);
	await rateLimits().signInAccount.clear(account);
}
