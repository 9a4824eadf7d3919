/**
 * ORCID sign-ins in progress, kept in the server's memory under a random handle that only the
 * browser's short-lived cookie carries: the state, nonce and PKCE verifier of a started sign-in,
 * and, after ORCID answered with an iD no account has, that iD until a password sign-in links it.
 * Each is used once and lasts minutes; a restart forgets them (the person starts again).
 */
import { randomBytes } from 'node:crypto';

export interface OrcidAttempt {
	state: string;
	nonce: string;
	verifier: string;
	/** Where to go after signing in (a safe path). */
	next: string;
	/** The signed-in account that asked to link an iD from its account page; null: a sign-in. */
	linkFor: string | null;
}

/** An iD ORCID vouched for that no account has yet. */
export interface OrcidPending {
	orcid: string;
	name: string | null;
	next: string;
}

export const ATTEMPT_SECONDS = 600;
export const PENDING_SECONDS = 900;
/** Beyond this many live entries the oldest go first, so a flood of starts cannot fill memory. */
const MOST = 10_000;

class ShortStore<T> {
	private readonly entries = new Map<string, { value: T; expiresAt: number }>();
	constructor(private readonly seconds: number) {}

	keep(value: T): string {
		const handle = randomBytes(32).toString('base64url');
		const now = Date.now();
		for (const [key, entry] of this.entries) if (entry.expiresAt <= now) this.entries.delete(key);
		while (this.entries.size >= MOST) this.entries.delete(this.entries.keys().next().value!);
		this.entries.set(handle, { value, expiresAt: now + this.seconds * 1000 });
		return handle;
	}

	peek(handle: string | undefined): T | null {
		const entry = handle ? this.entries.get(handle) : undefined;
		return entry && entry.expiresAt > Date.now() ? entry.value : null;
	}

	/** The value, forgotten at once: a handle works one time. */
	take(handle: string | undefined): T | null {
		const value = this.peek(handle);
		if (handle) this.entries.delete(handle);
		return value;
	}
}

export const orcidAttempts = new ShortStore<OrcidAttempt>(ATTEMPT_SECONDS);
export const orcidPending = new ShortStore<OrcidPending>(PENDING_SECONDS);
