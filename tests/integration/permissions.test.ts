/**
 * The permission module's rules, actor kind × action, against a real SQLite file. The expected
 * table is product.md's "People and roles" (author, group lead, editor, referee, admin), plus the
 * house rule that anything not visible is hidden (404) and visible-but-not-allowed is denied (403).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ANONYMOUS, type Actor, type TokenActor } from '../../src/lib/server/core/actor';
import {
	decideClaim,
	decideGroup,
	decideService,
	decideToken,
	requireClaim,
	type ClaimAction,
	type Decision,
	type GroupAction,
	type ServiceAction
} from '../../src/lib/server/access/permissions';
import { ForbiddenError, NotFoundError } from '../../src/lib/server/core/errors';
import { newId } from '../../src/lib/server/core/ids';
import { asReferee, asUser } from './actors';
import { addGroup, addUser, claimFields } from './backend-fixtures';
import { temporaryDatabase } from './db';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
const people: Record<string, Actor> = {};
let lake: string, ridgeClaimId: string;
let lakeClaim: { id: string; groupId: string; createdBy: string };
/** A claim the author (not the lead) wrote, and a second author of the same group. */
let authorsClaim: { id: string; groupId: string; createdBy: string }, otherAuthor: Actor;

const tokenOf = (userId: string): TokenActor => ({
	kind: 'token',
	userId,
	accountRole: 'researcher',
	emailVerified: true,
	tokenId: 'token-under-test',
	scope: 'claims'
});

async function addClaim(groupId: string, createdBy: string): Promise<string> {
	const id = newId();
	const { title, sourceDescription, dimension, method, claimedSchmidtNumber } = claimFields;
	await ctx.database.models.Claim.create({
		...{ id, groupId, createdBy, title, sourceDescription, dimension, method },
		...{ bases: [0, 1], claimedSchmidtNumber, manuscriptReference: null, state: 'draft' }
	});
	return id;
}

beforeAll(async () => {
	ctx = await temporaryDatabase();
	lake = await addGroup(ctx.database, 'Lake optics');
	const ridge = await addGroup(ctx.database, 'Ridge qudits');
	const ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'lead']]);
	const ben = await addUser(ctx.database, 'Ben Osei', [[lake, 'author']]);
	const cyd = await addUser(ctx.database, 'Cyd Marsh', [[ridge, 'lead']]);
	const eda = await addUser(ctx.database, 'Eda Kern', []);
	const adm = await addUser(ctx.database, 'Adm Rowe', []);
	const nob = await addUser(ctx.database, 'Nob Vik', []);
	const ida = await addUser(ctx.database, 'Ida Sund', []);
	const { User } = ctx.database.models;
	await User.update({ accountRole: 'editor' }, { where: { id: [eda, ida] } });
	await User.update({ accountRole: 'admin' }, { where: { id: adm } });
	lakeClaim = { id: await addClaim(lake, ada), groupId: lake, createdBy: ada };
	authorsClaim = { id: await addClaim(lake, ben), groupId: lake, createdBy: ben };
	otherAuthor = asUser(await addUser(ctx.database, 'Dag Ruud', [[lake, 'author']]));
	ridgeClaimId = await addClaim(ridge, cyd);
	await ctx.database.models.Share.create({
		...{ id: newId(), claimId: lakeClaim.id, editorEmail: 'ida@example.test', editorId: ida },
		...{ journal: 'J', manuscript: 'M', tokenHash: newId(), sharedBy: ada }
	});
	Object.assign(people, {
		anonymous: ANONYMOUS,
		lead: asUser(ada),
		author: asUser(ben),
		leadToken: tokenOf(ada),
		authorToken: tokenOf(ben),
		outsider: asUser(cyd),
		editor: asUser(eda, 'editor'),
		sharedEditor: asUser(ida, 'editor'),
		admin: asUser(adm, 'admin'),
		loner: asUser(nob),
		referee: asReferee(lakeClaim.id),
		otherReferee: asReferee(ridgeClaimId)
	});
});
afterAll(async () => ctx.close());

const A: Decision = 'allowed';
const D: Decision = 'denied';
const H: Decision = 'hidden';

describe('claims', () => {
	const actions: ClaimAction[] = [
		'read',
		'read-datasets',
		'add-dataset',
		'remove-dataset',
		'edit-claim',
		'withdraw-claim',
		'start-check',
		'cancel-check',
		'issue-certificate',
		'file-report',
		'share',
		'review'
	];
	// Editors see a claim only once it is shared with them (an open share, issue 9).
	// The lead wrote this claim: the author, a member who did not, may not edit it.
	const table: Record<string, Decision[]> = {
		anonymous: [H, H, H, H, H, H, H, H, H, H, H, H],
		lead: [A, A, A, A, A, A, A, A, A, D, A, D],
		author: [A, A, A, A, D, D, A, A, A, D, A, D],
		leadToken: [A, A, A, A, A, A, A, A, A, D, A, D],
		authorToken: [A, A, A, A, D, D, A, A, A, D, A, D],
		outsider: [H, H, H, H, H, H, H, H, H, H, H, H],
		editor: [H, H, H, H, H, H, H, H, H, H, H, H],
		sharedEditor: [A, A, D, D, D, D, D, D, D, D, D, A],
		admin: [H, H, H, H, H, H, H, H, H, H, H, H],
		loner: [H, H, H, H, H, H, H, H, H, H, H, H],
		referee: [A, A, D, D, D, D, A, A, D, A, D, D],
		otherReferee: [H, H, H, H, H, H, H, H, H, H, H, H]
	};
	for (const [who, expected] of Object.entries(table)) {
		it(`${who}: ${expected.join(' ')}`, async () => {
			const got = [];
			for (const action of actions)
				got.push(await decideClaim(ctx.database, people[who], lakeClaim, action));
			expect(got).toEqual(expected);
		});
	}

	it('lets a claim be edited or withdrawn by the member who wrote it and by a lead, not by another author', async () => {
		const withdraw = (actor: Actor) =>
			decideClaim(ctx.database, actor, authorsClaim, 'withdraw-claim');
		expect(await withdraw(people.author)).toBe(A);
		expect(await withdraw(people.lead)).toBe(A);
		expect(await withdraw(otherAuthor)).toBe(D);
		const decide = (actor: Actor) => decideClaim(ctx.database, actor, authorsClaim, 'edit-claim');
		expect(await decide(people.author)).toBe(A);
		expect(await decide(people.authorToken)).toBe(A);
		expect(await decide(people.lead)).toBe(A);
		expect(await decide(otherAuthor)).toBe(D);
		expect(await decide(people.outsider)).toBe(H);
		await expect(
			requireClaim(ctx.database, otherAuthor, authorsClaim.id, 'edit-claim')
		).rejects.toThrow('Only the claim’s author or a group lead may edit it.');
	});

	it('turns hidden into NotFoundError and denied into ForbiddenError', async () => {
		await expect(
			requireClaim(ctx.database, people.outsider, lakeClaim.id, 'read')
		).rejects.toBeInstanceOf(NotFoundError);
		await expect(
			requireClaim(ctx.database, people.referee, lakeClaim.id, 'add-dataset')
		).rejects.toBeInstanceOf(ForbiddenError);
		await expect(
			requireClaim(ctx.database, people.lead, 'no-such-claim', 'read')
		).rejects.toBeInstanceOf(NotFoundError);
		expect((await requireClaim(ctx.database, people.referee, lakeClaim.id, 'read')).id).toBe(
			lakeClaim.id
		);
	});
});

describe('groups', () => {
	const actions: GroupAction[] = ['read', 'create-claim', 'manage'];
	const table: Record<string, Decision[]> = {
		anonymous: [H, H, H],
		lead: [A, A, A],
		author: [A, A, D],
		leadToken: [A, A, D],
		authorToken: [A, A, D],
		outsider: [H, H, H],
		editor: [H, H, H],
		admin: [H, H, H],
		referee: [H, H, H]
	};
	for (const [who, expected] of Object.entries(table)) {
		it(`${who}: ${expected.join(' ')}`, async () => {
			const got = [];
			for (const action of actions)
				got.push((await decideGroup(ctx.database, people[who], lake, action)).decision);
			expect(got).toEqual(expected);
		});
	}
});

describe('accounts, tokens, the outbox and the archive', () => {
	const actions: ServiceAction[] = [
		'create-group',
		'join-group',
		'own-account',
		'issue-token',
		'manage-tokens',
		'manage-accounts',
		'read-outbox',
		'read-archive',
		'read-service-health',
		'read-doi-outbox',
		'retry-doi'
	];
	// read-archive: a group's archive, so only for someone in a group (a token as its owner).
	const table: Record<string, Decision[]> = {
		anonymous: [D, D, D, D, D, D, D, D, D, D, D],
		lead: [A, A, A, A, A, D, D, A, D, D, D],
		author: [A, A, A, A, A, D, D, A, D, D, D],
		leadToken: [D, D, D, D, D, D, D, A, D, D, D],
		editor: [A, A, A, A, A, D, D, D, D, D, D],
		admin: [A, A, A, D, A, A, A, D, A, A, A],
		loner: [A, A, A, D, A, D, D, D, D, D, D],
		referee: [D, D, D, D, D, D, D, D, D, D, D]
	};
	for (const [who, expected] of Object.entries(table)) {
		it(`${who}: ${expected.join(' ')}`, async () => {
			const got = [];
			for (const action of actions)
				got.push(await decideService(ctx.database, people[who], action));
			expect(got).toEqual(expected);
		});
	}

	it('re-reads the admin role, so a demoted admin loses it at once', async () => {
		const admin = people.admin as { userId: string };
		const { User } = ctx.database.models;
		await User.update({ accountRole: 'researcher' }, { where: { id: admin.userId } });
		expect(await decideService(ctx.database, people.admin, 'manage-accounts')).toBe(D);
		await User.update({ accountRole: 'admin' }, { where: { id: admin.userId } });
	});

	it('shows a token to its owner only; a token never manages tokens', () => {
		const owned = { userId: (people.lead as { userId: string }).userId };
		expect(decideToken(people.lead, owned)).toBe(A);
		expect(decideToken(people.author, owned)).toBe(H);
		expect(decideToken(people.leadToken, owned)).toBe(D);
		expect(decideToken(people.referee, owned)).toBe(H);
		expect(decideToken(ANONYMOUS, owned)).toBe(H);
	});
});
