/**
 * Fair use of the workers: how many checks one person, one group and one review link may have
 * queued or running at once. Review re-runs count in their link's own bucket, not against the
 * group, so that neither side can crowd out the other.
 */
import { Op, type Transaction } from 'sequelize';
import type { Actor, RefereeActor } from '../core/actor';
import { config } from '../core/config';
import type { Database } from '../db';
import { ACTIVE_CHECK_STATUSES } from '../db/models/Check';
import { RateLimitedError } from '../core/errors';

/**
 * Starts a check may have: one found cut off while running (a kill, a crash of the process)
 * this many times is failed at the next start instead of queued again (checks/left-behind.ts).
 */
export const MAX_CHECK_STARTS = 3;

/** A referee re-runs one check at a time: a link cannot queue up the service's workers. */
export const RERUNS_PER_REVIEW_LINK = 1;

/** Refuses a new check over any limit, naming it; run inside the transaction that queues it. */
export async function refuseOverCheckLimits(
	database: Database,
	actor: Actor,
	groupId: string,
	transaction: Transaction
): Promise<void> {
	if (actor.kind === 'referee') return refuseOverLinkLimit(database, actor, transaction);
	if (actor.kind !== 'user' && actor.kind !== 'token') return;
	const { checksPerUser, checksPerGroup, checkRetryAfterSeconds: wait } = config();
	const { Check, Claim } = database.models;
	const active = { status: ACTIVE_CHECK_STATUSES };
	const own = await Check.count({ where: { ...active, createdBy: actor.userId }, transaction });
	if (own >= checksPerUser)
		throw new RateLimitedError(
			`You have ${own} checks queued or running; the limit is ${checksPerUser} per person. Wait for one to finish or cancel one.`,
			wait
		);
	const claims = await Claim.findAll({ where: { groupId }, attributes: ['id'], transaction });
	const claimIds = claims.map((c) => c.get('id') as string);
	const where = { ...active, claimId: claimIds, reviewLinkId: { [Op.is]: null } };
	const group = await Check.count({ where, transaction });
	if (group >= checksPerGroup)
		throw new RateLimitedError(
			`This group has ${group} checks queued or running; the limit is ${checksPerGroup} per group. Wait for one to finish or cancel one.`,
			wait
		);
}

async function refuseOverLinkLimit(
	database: Database,
	referee: RefereeActor,
	transaction: Transaction
): Promise<void> {
	const where = { status: ACTIVE_CHECK_STATUSES, reviewLinkId: referee.linkId };
	const running = await database.models.Check.count({ where, transaction });
	if (running < RERUNS_PER_REVIEW_LINK) return;
	throw new RateLimitedError(
		`A re-run from this review link is still queued or running; the limit is ${RERUNS_PER_REVIEW_LINK} at a time per link. Wait for it to finish or cancel it.`,
		config().checkRetryAfterSeconds
	);
}
