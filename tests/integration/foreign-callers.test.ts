/**
 * Every service that reads or changes a group's things answers NotFoundError (404) to a caller
 * from outside: another group's lead, that lead's API token, a referee of another claim and an
 * anonymous caller alike, so that ids do not leak (house style: "anything not visible is 404").
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ANONYMOUS, type Actor, type TokenActor } from '../../src/lib/server/core/actor';
import { updateClaim } from '../../src/lib/server/claims/claim-edit';
import { getCheck, listChecks, startCheck } from '../../src/lib/server/checks/checks';
import { createClaim, getClaim, listClaims } from '../../src/lib/server/claims/claims';
import {
	addDataset,
	datasetTables,
	getDataset,
	listDatasets
} from '../../src/lib/server/datasets/datasets';
import { removeDataset } from '../../src/lib/server/datasets/dataset-removal';
import { ForbiddenError, NotFoundError } from '../../src/lib/server/core/errors';
import { changeMemberRole, getGroup, removeMember } from '../../src/lib/server/accounts/groups';
import { newId } from '../../src/lib/server/core/ids';
import {
	inviteMember,
	listInvitations,
	revokeInvitation
} from '../../src/lib/server/accounts/invitations';
import { createToken, revokeToken } from '../../src/lib/server/accounts/tokens';
import { asReferee, asUser } from './actors';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { mailWorld, type MailWorld } from './mail-world';

let world: MailWorld;
let groupId: string, leadId: string, authorId: string;
let claimId: string, datasetId: string, checkId: string, invitationId: string, tokenId: string;
const foreigners: Record<string, Actor> = {};

beforeAll(async () => {
	world = await mailWorld();
	const { database } = world;
	groupId = await addGroup(database, 'Lake optics');
	const ridge = await addGroup(database, 'Ridge qudits');
	leadId = await addUser(database, 'Ada Lind', [[groupId, 'lead']]);
	authorId = await addUser(database, 'Ben Osei', [[groupId, 'author']]);
	const cyd = await addUser(database, 'Cyd Marsh', [[ridge, 'lead']]);
	const lead = asUser(leadId);
	claimId = (await createClaim(database, lead, claimFields)).id;
	const upload = { bytes: bytesOf(countsCsv()), originalName: 'run.csv' };
	datasetId = (await addDataset(database, lead, claimId, upload)).id;
	// A finished check row is enough here; running the engine is checks.test.ts's business.
	checkId = newId();
	await database.models.Check.create({
		...{ id: checkId, claimId, datasetId, createdBy: leadId, status: 'failed', progress: 0 },
		...{ resamples: 1000, confidence: 0.95, seed: 1, error: 'fixture' }
	});
	const invite = { email: 'new@lake.test', role: 'author' as const };
	({ invitationId } = await inviteMember(database, lead, groupId, invite));
	tokenId = (await createToken(database, lead, { name: 'lab' })).id;
	const ridgeClaim = await createClaim(database, asUser(cyd), claimFields);
	const token: TokenActor = {
		...{ kind: 'token', userId: cyd, accountRole: 'researcher', emailVerified: true },
		...{ tokenId: 'ridge-token', scope: 'claims' }
	};
	Object.assign(foreigners, {
		'another group’s lead': asUser(cyd),
		'their API token': token,
		'a referee of another claim': asReferee(ridgeClaim.id),
		anonymous: ANONYMOUS
	});
});
afterAll(async () => world?.close());

const calls: Record<string, (actor: Actor) => Promise<unknown>> = {
	getClaim: (a) => getClaim(world.database, a, claimId),
	updateClaim: (a) => updateClaim(world.database, a, claimId, { ...claimFields, title: 'Taken' }),
	createClaim: (a) => createClaim(world.database, a, { ...claimFields, groupId }),
	listDatasets: (a) => listDatasets(world.database, a, claimId),
	getDataset: (a) => getDataset(world.database, a, datasetId),
	datasetTables: (a) => datasetTables(world.database, a, datasetId),
	addDataset: (a) =>
		addDataset(world.database, a, claimId, { bytes: bytesOf(countsCsv()), originalName: 'x' }),
	removeDataset: (a) => removeDataset(world.database, a, claimId, datasetId),
	listChecks: (a) => listChecks(world.database, a, claimId),
	getCheck: (a) => getCheck(world.database, a, checkId),
	startCheck: (a) => startCheck(world.database, a, claimId, {}),
	getGroup: (a) => getGroup(world.database, a, groupId),
	changeMemberRole: (a) => changeMemberRole(world.database, a, groupId, authorId, 'lead'),
	removeMember: (a) => removeMember(world.database, a, groupId, authorId),
	inviteMember: (a) =>
		inviteMember(world.database, a, groupId, { email: 'x@y.test', role: 'lead' }),
	listInvitations: (a) => listInvitations(world.database, a, groupId),
	revokeInvitation: (a) => revokeInvitation(world.database, a, groupId, invitationId)
};

describe('a caller from outside the group', () => {
	for (const [name, call] of Object.entries(calls)) {
		it(`gets NotFoundError from ${name}`, async () => {
			for (const [who, actor] of Object.entries(foreigners)) {
				const outcome = await call(actor).then(
					() => `${who}: allowed`,
					(e: unknown) => (e instanceof NotFoundError ? 'not found' : `${who}: ${String(e)}`)
				);
				expect(outcome).toBe('not found');
			}
		});
	}

	it('gets NotFoundError for another person’s token', async () => {
		await expect(
			revokeToken(world.database, foreigners['another group’s lead'], tokenId)
		).rejects.toBeInstanceOf(NotFoundError);
	});

	it('changed nothing while trying', async () => {
		const { Claim, Dataset, Check, Membership, Invitation, ApiToken } = world.database.models;
		expect((await Claim.findByPk(claimId))?.get('title')).toBe(claimFields.title);
		expect(await Dataset.count({ where: { claimId } })).toBe(1);
		expect(await Check.count({ where: { claimId } })).toBe(1);
		expect(await Membership.findOne({ where: { userId: authorId } })).toMatchObject({
			dataValues: expect.objectContaining({ role: 'author' })
		});
		expect(await Invitation.count({ where: { id: invitationId } })).toBe(1);
		expect((await ApiToken.findByPk(tokenId))?.get('revokedAt')).toBeNull();
	});
});

describe('a referee of this claim (the review-link caller of issue 9, built by hand)', () => {
	const referee = () => asReferee(claimId);

	it('reads the claim and its checks, and lists that claim only', async () => {
		expect((await getClaim(world.database, referee(), claimId)).id).toBe(claimId);
		expect((await listChecks(world.database, referee(), claimId)).map((c) => c.id)).toEqual([
			checkId
		]);
		expect((await getCheck(world.database, referee(), checkId)).id).toBe(checkId);
		const listing = await listClaims(world.database, referee());
		expect(listing.items.map((c) => c.id)).toEqual([claimId]);
	});

	// The counts are in the evidence bundle the referee downloads, so reading them is allowed.
	it('reads but may not add or remove counts files, nor edit the claim (403), nor see the group (404)', async () => {
		expect((await listDatasets(world.database, referee(), claimId)).length).toBeGreaterThan(0);
		await expect(calls.addDataset(referee())).rejects.toBeInstanceOf(ForbiddenError);
		await expect(calls.removeDataset(referee())).rejects.toBeInstanceOf(ForbiddenError);
		await expect(calls.updateClaim(referee())).rejects.toBeInstanceOf(ForbiddenError);
		await expect(calls.getGroup(referee())).rejects.toBeInstanceOf(NotFoundError);
		await expect(calls.createClaim(referee())).rejects.toBeInstanceOf(NotFoundError);
	});
});
