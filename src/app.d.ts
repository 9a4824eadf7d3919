// See https://svelte.dev/docs/kit/types#app.d.ts
import type { Session, User } from 'lucia';
import type { Actor } from '$lib/server/core/actor';
import type { RateLimitedError } from '$lib/server/core/errors';

declare global {
	namespace App {
		interface Error {
			code?: string;
		}
		interface Locals {
			/** Who is asking; services take this. */
			actor: Actor;
			/** The signed-in user, for display and signing out only (null for token callers). */
			user: User | null;
			session: Session | null;
			/** A review-link use over its limit (review-handle.ts): the page answers 429 with it. */
			refusal?: RateLimitedError;
		}
		// interface PageData {}
		// interface PageState {}
		// interface Platform {}
	}
}

export {};
