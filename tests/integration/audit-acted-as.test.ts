/**
 * Audit rows say how the caller acted (issue 18): through a session, an API token (which one) or
 * a review link (which one); the hooks run each request inside runAs, as done here.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runAs } from '../../src/lib/server/core/acting';
import { audit } from '../../src/lib/server/core/audit';
import { createClaim } from '../../src/lib/server/claims/claims';
import { authenticate, createToken } from '../../src/lib/server/accounts/tokens';
import { asReferee, asUser } from './actors';
import { addGroup, addUser, claimFields } from './backend-fixtures';
import { temporaryDatabase } from './db';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
beforeAll(async () => {
	ctx = await temporaryDatabase();
});
afterAll(async () => ctx.close());

const detailsOf = async (action: string, subjectId: string) =>
	(await ctx.database.models.AuditEvent.findOne({ where: { action, subjectId } }))!.get(
		'details'
	) as Record<string, unknown>;

describe('actedAs', () => {
	it('names the API token that created a claim, and the session otherwise', async () => {
		const { database } = ctx;
		const group = await addGroup(database, 'Lake optics');
		const owner = asUser(await addUser(database, 'Ada Lind', [[group, 'lead']]));
		const { token, id: tokenId } = await createToken(database, owner, { name: 'pipeline' });
		const script = (await authenticate(database, token))!;
		const viaToken = await runAs(script, () => createClaim(database, script, claimFields));
		const viaSession = await runAs(owner, () => createClaim(database, owner, claimFields));
		const created = (await database.models.AuditEvent.findOne({
			where: { subjectId: viaToken.id }
		}))!.get('action') as string;
		expect((await detailsOf(created, viaToken.id)).actedAs).toEqual({ by: 'api-token', tokenId });
		expect((await detailsOf(created, viaSession.id)).actedAs).toEqual({ by: 'session' });
	});

	it('names the review link a referee acted through; nothing outside a request', async () => {
		const referee = asReferee('claim-x');
		const entry = { actorId: null, action: 'test.referee', subjectType: 'check' };
		await runAs(referee, () => audit(ctx.database, { ...entry, subjectId: 'a' }));
		await audit(ctx.database, { ...entry, subjectId: 'b' });
		expect((await detailsOf('test.referee', 'a')).actedAs).toEqual({
			by: 'review-link',
			reviewLinkId: referee.linkId
		});
		expect((await detailsOf('test.referee', 'b')).actedAs).toBeUndefined();
	});
});
