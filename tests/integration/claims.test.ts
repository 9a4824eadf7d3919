import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createClaim, getClaim, listClaims } from '../../src/lib/server/claims/claims';
import { ForbiddenError, NotFoundError } from '../../src/lib/server/core/errors';
import { addGroup, addUser, claimFields } from './backend-fixtures';
import { asUser } from './actors';
import { temporaryDatabase } from './db';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
let lake: string, ridge: string, ada: string, ben: string, cyd: string;

beforeAll(async () => {
	ctx = await temporaryDatabase();
	lake = await addGroup(ctx.database, 'Lake optics');
	ridge = await addGroup(ctx.database, 'Ridge qudits');
	ada = await addUser(ctx.database, 'Ada Lind', [[lake, 'lead']]);
	ben = await addUser(ctx.database, 'Ben Osei', [
		[lake, 'author'],
		[ridge, 'author']
	]);
	cyd = await addUser(ctx.database, 'Cyd Marsh', [[ridge, 'lead']]);
	const titles = ['Bravo source', 'alpha source', 'Charlie 100% pure', 'Delta_source'];
	for (const [i, title] of titles.entries()) {
		await createClaim(ctx.database, asUser(ada), {
			...claimFields,
			title,
			dimension: 4 + i,
			claimedSchmidtNumber: 2 + i
		});
	}
	await createClaim(ctx.database, asUser(cyd), {
		...claimFields,
		title: 'Ridge frequency bins',
		method: 'steering-2mub'
	});
});
afterAll(async () => ctx.close());

describe('claims service', () => {
	it('creates a draft claim in the first group with the method’s default bases', async () => {
		const claim = await createClaim(ctx.database, asUser(ada), {
			...claimFields,
			manuscriptReference: ''
		});
		expect(claim).toMatchObject({
			groupId: lake,
			groupName: 'Lake optics',
			state: 'draft',
			bases: [0, 1],
			manuscriptReference: null,
			createdBy: { id: ada, name: 'Ada Lind' },
			latestCheck: null
		});
		expect(claim.createdAt).toMatch(/^\d{4}-\d\d-\d\dT/);
		const audit = await ctx.database.models.AuditEvent.findOne({ where: { subjectId: claim.id } });
		expect(audit?.get('action')).toBe('claim.created');
		await ctx.database.models.Claim.destroy({ where: { id: claim.id } });
		await ctx.database.models.AuditEvent.destroy({ where: { subjectId: claim.id } });
	});

	it('rejects bases that do not exist in the dimension and a claim above d, naming the fields', async () => {
		const bad = { ...claimFields, dimension: 6, bases: [0, 1, 2], claimedSchmidtNumber: 7 };
		await expect(createClaim(ctx.database, asUser(ada), bad)).rejects.toThrow(
			/claimedSchmidtNumber|exceed/
		);
		await expect(createClaim(ctx.database, asUser(ada), bad)).rejects.toThrow(
			/Basis 2 does not exist in dimension 6/
		);
	});

	it('creates into a named group only when the user belongs to it', async () => {
		await expect(
			createClaim(ctx.database, asUser(ada), { ...claimFields, groupId: ridge })
		).rejects.toBeInstanceOf(NotFoundError);
		const loner = await addUser(ctx.database, 'Lone Reader');
		await expect(createClaim(ctx.database, asUser(loner), claimFields)).rejects.toBeInstanceOf(
			ForbiddenError
		);
	});

	it('lists only the claims of the user’s groups', async () => {
		expect((await listClaims(ctx.database, asUser(ada))).total).toBe(4);
		expect((await listClaims(ctx.database, asUser(cyd))).total).toBe(1);
		expect((await listClaims(ctx.database, asUser(ben))).total).toBe(5);
	});

	it('sorts by title without regard to case, and by dimension both ways', async () => {
		const byTitle = await listClaims(ctx.database, asUser(ada), { sort: 'title', order: 'asc' });
		expect(byTitle.items.map((c) => c.title)).toEqual([
			'alpha source',
			'Bravo source',
			'Charlie 100% pure',
			'Delta_source'
		]);
		const byDimension = await listClaims(ctx.database, asUser(ada), {
			sort: 'dimension',
			order: 'desc'
		});
		expect(byDimension.items.map((c) => c.dimension)).toEqual([7, 6, 5, 4]);
		const newestFirst = await listClaims(ctx.database, asUser(ada));
		expect(newestFirst.items[0].title).toBe('Delta_source');
	});

	it('searches the text literally (% and _ are not wildcards) and filters by method and state', async () => {
		expect(
			(await listClaims(ctx.database, asUser(ada), { q: '100%' })).items.map((c) => c.title)
		).toEqual(['Charlie 100% pure']);
		expect((await listClaims(ctx.database, asUser(ada), { q: 'vo_so' })).total).toBe(0);
		expect(
			(await listClaims(ctx.database, asUser(ada), { q: 'a_s' })).items.map((c) => c.title)
		).toEqual(['Delta_source']);
		expect((await listClaims(ctx.database, asUser(ada), { q: 'BRAVO' })).total).toBe(1);
		expect(
			(await listClaims(ctx.database, asUser(ben), { method: 'steering-2mub' })).items.map(
				(c) => c.title
			)
		).toEqual(['Ridge frequency bins']);
		expect((await listClaims(ctx.database, asUser(ben), { state: 'checked' })).total).toBe(0);
	});

	it('pages, keeping the total', async () => {
		const second = await listClaims(ctx.database, asUser(ben), {
			sort: 'title',
			order: 'asc',
			page: 2,
			pageSize: 2
		});
		expect(second).toMatchObject({ total: 5, page: 2, pageSize: 2 });
		expect(second.items.map((c) => c.title)).toEqual(['Charlie 100% pure', 'Delta_source']);
		expect((await listClaims(ctx.database, asUser(ben), { page: 9, pageSize: 2 })).items).toEqual(
			[]
		);
	});

	it('hides a claim of another group (null, as for a missing one)', async () => {
		const ridgeClaim = (await listClaims(ctx.database, asUser(cyd))).items[0];
		await expect(getClaim(ctx.database, asUser(ada), ridgeClaim.id)).rejects.toBeInstanceOf(
			NotFoundError
		);
		await expect(getClaim(ctx.database, asUser(ada), 'no-such-claim')).rejects.toBeInstanceOf(
			NotFoundError
		);
		expect((await getClaim(ctx.database, asUser(ben), ridgeClaim.id))?.title).toBe(
			'Ridge frequency bins'
		);
	});
});
