/**
 * The one table of rate limits, kept in memory (rate-limiter-flexible) per process. A `window`
 * limit counts attempts in a fixed window and refuses past its points; a `ladder` counts failures:
 * the first `free` cost nothing, each further one makes the next attempt wait twice as long as
 * the last, and past `cap` every attempt is refused until the window ends. RANKSEAL_RATE_LIMITS
 * (JSON, e.g. `{"signInAccount":{"free":2}}`) overrides any field, for the demo, tests and bench.
 */
import { RateLimiterMemory } from 'rate-limiter-flexible';
import { z } from 'zod';
import { RateLimitedError } from './errors';

const windowRule = z.object({
	kind: z.literal('window'),
	points: z.number().int().min(1),
	windowSeconds: z.number().int().min(1)
});
const ladderRule = z.object({
	kind: z.literal('ladder'),
	free: z.number().int().min(0),
	cap: z.number().int().min(1),
	windowSeconds: z.number().int().min(1),
	firstDelaySeconds: z.number().int().min(1)
});
export type WindowRule = z.infer<typeof windowRule>;
export type LadderRule = z.infer<typeof ladderRule>;

/**
 * Keys: sign-in per account and client address (the pause a person meets), per account from
 * every address (a much higher ceiling, waived for an address the account signed in from), per
 * client address; the rest as named.
 */
export const RATE_LIMITS = {
	signInAccountAddress: {
		kind: 'ladder',
		free: 5,
		cap: 20,
		windowSeconds: 3600,
		firstDelaySeconds: 2
	},
	signInAccount: { kind: 'ladder', free: 30, cap: 300, windowSeconds: 3600, firstDelaySeconds: 1 },
	signInAddress: { kind: 'ladder', free: 20, cap: 200, windowSeconds: 3600, firstDelaySeconds: 1 },
	signUp: { kind: 'window', points: 10, windowSeconds: 3600 },
	resetRequest: { kind: 'window', points: 10, windowSeconds: 3600 },
	resendVerification: { kind: 'window', points: 5, windowSeconds: 3600 },
	invitations: { kind: 'window', points: 30, windowSeconds: 3600 },
	/** Every request through one review link. */
	reviewUse: { kind: 'window', points: 300, windowSeconds: 60 },
	/** Unknown, expired or revoked review links, per client address (guessing tokens). */
	reviewRefused: { kind: 'ladder', free: 20, cap: 100, windowSeconds: 3600, firstDelaySeconds: 1 },
	/** Bundles checked on the public /seal page, per client address (each costs a worker thread). */
	sealBundle: { kind: 'window', points: 20, windowSeconds: 600 },
	/** Certificates looked up on /seal by ID or fingerprint, per client address. */
	sealLookup: { kind: 'window', points: 120, windowSeconds: 60 },
	/** Planner answers with simulated counts (seconds of work each), per client address. */
	planSimulations: { kind: 'window', points: 30, windowSeconds: 3600 },
	/** Mails written to one recipient; enforced by the outbox (services/mail-queue.ts). */
	mailPerRecipient: { kind: 'window', points: 20, windowSeconds: 3600 }
} as const satisfies Record<string, WindowRule | LadderRule>;

export type LimitName = keyof typeof RATE_LIMITS;
type WindowName = {
	[K in LimitName]: (typeof RATE_LIMITS)[K]['kind'] extends 'window' ? K : never;
}[LimitName];
type LadderName = Exclude<LimitName, WindowName>;

type RuleOf<K extends LimitName> = (typeof RATE_LIMITS)[K]['kind'] extends 'window'
	? WindowRule
	: LadderRule;
export type LimitRules = { [K in LimitName]: RuleOf<K> };

const windowPatch = windowRule.omit({ kind: true }).partial().strict();
const ladderPatch = ladderRule.omit({ kind: true }).partial().strict();
const overridesSchema = z
	.object(
		Object.fromEntries(
			Object.entries(RATE_LIMITS).map(([name, rule]) => [
				name,
				rule.kind === 'window' ? windowPatch : ladderPatch
			])
		)
	)
	.partial()
	.strict();

/** The table with RANKSEAL_RATE_LIMITS applied; a bad value stops the start naming its field. */
export function rateLimitRules(env = process.env.RANKSEAL_RATE_LIMITS): LimitRules {
	let overrides: Record<string, object | undefined> = {};
	if (env?.trim()) {
		const parsed = overridesSchema.safeParse(JSON.parse(env));
		if (!parsed.success) {
			const issue = parsed.error.issues[0];
			throw new Error(`RANKSEAL_RATE_LIMITS: ${issue.path.join('.')}: ${issue.message}`);
		}
		overrides = parsed.data;
	}
	const rules = {} as Record<LimitName, WindowRule | LadderRule>;
	for (const name of Object.keys(RATE_LIMITS) as LimitName[])
		rules[name] = { ...RATE_LIMITS[name], ...overrides[name] };
	return rules as LimitRules;
}

/** Whole seconds to wait, at least one. */
const secondsOf = (ms: number) => Math.max(1, Math.ceil(ms / 1000));

/** Attempts in a fixed window: take() counts one and refuses past the points. */
export class WindowLimit {
	private readonly store: RateLimiterMemory;
	constructor(readonly rule: WindowRule) {
		this.store = new RateLimiterMemory({ points: rule.points, duration: rule.windowSeconds });
	}

	/** Counts one attempt; null when allowed, else the seconds until the window ends. */
	async take(key: string): Promise<number | null> {
		const used = await this.store.penalty(key, 1);
		return used.consumedPoints > this.rule.points ? secondsOf(used.msBeforeNext) : null;
	}
}

/** Failures with growing pauses: check() before the attempt, fail() or clear() after it. */
export class LadderLimit {
	private readonly failures: RateLimiterMemory;
	private readonly pauses = new RateLimiterMemory({ points: 1, duration: 1 });
	constructor(readonly rule: LadderRule) {
		this.failures = new RateLimiterMemory({ points: rule.cap, duration: rule.windowSeconds });
	}

	/** null when an attempt may go ahead, else the seconds to wait. */
	async check(key: string): Promise<number | null> {
		const counted = await this.failures.get(key);
		if (counted && counted.msBeforeNext > 0 && counted.consumedPoints >= this.rule.cap)
			return secondsOf(counted.msBeforeNext);
		const pause = await this.pauses.get(key);
		if (pause && pause.msBeforeNext > 0 && pause.consumedPoints > 1)
			return secondsOf(pause.msBeforeNext);
		return null;
	}

	/** Records a failure; returns the pause it starts in seconds (null while still free). */
	async fail(key: string): Promise<number | null> {
		const counted = await this.failures.penalty(key, 1);
		const n = counted.consumedPoints;
		if (n >= this.rule.cap) return secondsOf(counted.msBeforeNext);
		if (n <= this.rule.free) return null;
		const delay = Math.min(this.rule.firstDelaySeconds * 2 ** (n - this.rule.free - 1), 86400);
		await this.pauses.block(key, delay);
		return delay;
	}

	async clear(key: string): Promise<void> {
		await Promise.all([this.failures.delete(key), this.pauses.delete(key)]);
	}
}

type Limits = { [K in WindowName]: WindowLimit } & { [K in LadderName]: LadderLimit };
let current: Limits | null = null;

/** The process's limits, built from the table on first use. */
export function rateLimits(): Limits {
	if (current) return current;
	const rules = rateLimitRules();
	const built = {} as Record<LimitName, WindowLimit | LadderLimit>;
	for (const name of Object.keys(rules) as LimitName[]) {
		const rule = rules[name];
		built[name] = rule.kind === 'window' ? new WindowLimit(rule) : new LadderLimit(rule);
	}
	current = built as Limits;
	return current;
}

/** Forgets every count and re-reads RANKSEAL_RATE_LIMITS (tests). */
export function resetRateLimits(): void {
	current = null;
}

/** "in 8 seconds (at 11:42:10 UTC)": when to try again, in words. */
export function retryWords(seconds: number, now = new Date()): string {
	const at = new Date(now.getTime() + seconds * 1000).toISOString().slice(11, 19);
	const span =
		seconds < 120
			? `${seconds} second${seconds === 1 ? '' : 's'}`
			: seconds < 7200
				? `${Math.ceil(seconds / 60)} minutes`
				: `${Math.ceil(seconds / 3600)} hours`;
	return `in ${span} (at ${at} UTC)`;
}

/** Counts one attempt of a window limit; throws RateLimitedError with `what` when refused. */
export async function takeOrRefuse(name: WindowName, key: string, what: string): Promise<void> {
	const wait = await rateLimits()[name].take(key);
	if (wait !== null) throw new RateLimitedError(`${what} Try again ${retryWords(wait)}.`, wait);
}
