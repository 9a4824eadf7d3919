/** Callers for service tests, built as the hooks would build them (without a request). */
import type { RefereeActor, UserActor } from '../../src/lib/server/core/actor';
import type { AccountRole } from '../../src/lib/server/db/models/User';

export const asUser = (userId: string, accountRole: AccountRole = 'researcher'): UserActor => ({
	kind: 'user',
	userId,
	accountRole,
	emailVerified: true
});

/** The shape issue 9's review links will resolve to; no resolver exists yet. */
export const asReferee = (claimId: string): RefereeActor => ({
	kind: 'referee',
	claimId,
	linkId: 'review-link-under-test'
});
