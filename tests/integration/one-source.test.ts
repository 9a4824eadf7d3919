/**
 * One source per fact, against a real SQLite file and the real route modules: the claim list's
 * first direction for sort=title is the same on the page and in the API (A→Z), the claim list
 * and the archive find the same claims for the same search text, the withdrawal reason has
 * one limit (WITHDRAW_REASON) with one message on the claim page, the archive and the API, and
 * links in mail take the app's origin from one place (ORIGIN), whichever service writes them.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { isActionFailure } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addGroup, addUser, claimFields } from './backend-fixtures';

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-one-source-'));
process.env.RANKSEAL_DATA_DIR = folder;
process.env.MAIL_CATCHER_PORT = '0';
// The app's one origin: every link a service writes into mail starts with it.
const ORIGIN = 'https://rankseal.halvorsen.example';
process.env.ORIGIN = ORIGIN;

const { app } = await import('../../src/lib/server/app/app');
const { closeDb } = await import('../../src/lib/server/db');
const { createClaim } = await import('../../src/lib/server/claims/claims');
const { groupArchive } = await import('../../src/lib/server/claims/archive');
const { requestPasswordReset } = await import('../../src/lib/server/accounts/accounts');
const { inviteMember } = await import('../../src/lib/server/accounts/invitations');
const { WITHDRAW_REASON, WITHDRAW_REASON_WORDS } = await import('../../src/lib/claims/withdrawal');
const claimList = await import('../../src/routes/(app)/claims/+page.server');
const claimsApi = await import('../../src/routes/api/v1/claims/+server');
const claimPage = await import('../../src/routes/(app)/claims/[id]/+page.server');
const archivePage = await import('../../src/routes/(app)/archive/+page.server');
const withdrawApi = await import('../../src/routes/api/v1/claims/[id]/withdraw/+server');

let lead: string, groupId: string;
const ids: Record<string, string> = {};
const actor = () => ({
	kind: 'user',
	userId: lead,
	accountRole: 'researcher',
	emailVerified: true
});

function event(url: string, extra: Record<string, unknown> = {}) {
	const locals = { actor: actor(), user: { id: lead }, session: null };
	return { locals, url: new URL(url), params: {}, setHeaders: () => {}, ...extra } as never;
}

function post(url: string, fields: Record<string, string>) {
	const form = new FormData();
	for (const [key, value] of Object.entries(fields)) form.set(key, value);
	return new Request(url, { method: 'POST', body: form });
}

beforeAll(async () => {
	const { database } = await app();
	groupId = await addGroup(database, 'Halvorsen Lake Photonics');
	lead = await addUser(database, 'Ingrid Halvorsen', [[groupId, 'lead']]);
	// Made in this order, so newest-first and Z→A would both differ from A→Z.
	for (const title of ['beta fringe', 'Alpha comb', 'gamma lattice']) {
		const input = { ...claimFields, groupId, title, manuscriptReference: `HLP-${title.length}` };
		ids[title] = (await createClaim(database, actor() as never, input as never)).id;
	}
});

afterAll(async () => {
	const services = await app();
	await services.mailCatcher?.close();
	await closeDb();
	rmSync(folder, { recursive: true, force: true });
});

describe('sort=title', () => {
	const atoZ = ['Alpha comb', 'beta fringe', 'gamma lattice'];

	it('lists A→Z by default in the API, as the page does', async () => {
		const url = 'http://localhost/api/v1/claims?sort=title';
		const response = await claimsApi.GET(event(url));
		const body = (await response.json()) as { items: { title: string }[] };
		expect(body.items.map((c) => c.title)).toEqual(atoZ);
		const page = (await claimList.load(event('http://localhost/claims?sort=title'))) as {
			listing: { items: { title: string }[] };
		};
		expect(page.listing.items.map((c) => c.title)).toEqual(atoZ);
	});
});

describe('one text search for the claim list and the archive', () => {
	async function both(q: string) {
		const { database } = await app();
		const { listClaims } = await import('../../src/lib/server/claims/claims');
		const listed = (await listClaims(database, actor() as never, { q })).items.map((c) => c.id);
		const archive = await groupArchive(database, actor() as never, { group: groupId, q });
		return { listed: listed.sort(), archived: archive.claims.map((c) => c.id).sort() };
	}

	it('finds a claim by the start of its id in both, as pasted from a certificate', async () => {
		const id = ids['Alpha comb'];
		expect(await both(id.slice(0, 8).toUpperCase())).toEqual({ listed: [id], archived: [id] });
	});

	it('matches no id by a short piece from its middle, in either list', async () => {
		const id = ids['gamma lattice'];
		// Four characters after the first dash, with a digit, so no title or source holds them.
		const piece = id.slice(9, 13).replace(/^[a-f]{4}$/, id.slice(14, 18));
		expect(await both(piece)).toEqual({ listed: [], archived: [] });
	});

	it('finds the same claims by text in both', async () => {
		const found = await both('HLP-11');
		expect(found.listed).toEqual([ids['beta fringe']]);
		expect(found.archived).toEqual(found.listed);
	});
});

describe('the withdrawal reason, one limit', () => {
	const tooLong = 'r'.repeat(WITHDRAW_REASON.max * 4 + 1);

	it('refuses a reason past the limit with the same words on the claim page', async () => {
		const id = ids['beta fringe'];
		const url = `http://localhost/claims/${id}?/withdraw`;
		const request = post(url, { reason: tooLong, confirm: 'yes' });
		const result = await claimPage.actions.withdraw(event(url, { request, params: { id } }));
		expect(isActionFailure(result) && result.status).toBe(400);
		expect((result as { data: { errors: Record<string, string> } }).data.errors.reason).toBe(
			WITHDRAW_REASON_WORDS
		);
	});

	it('… in the archive', async () => {
		const url = 'http://localhost/archive?/withdraw';
		const request = post(url, { claimId: ids['beta fringe'], reason: tooLong });
		const result = await archivePage.actions.withdraw(event(url, { request }));
		expect((result as { data: { errors: Record<string, string> } }).data.errors.reason).toBe(
			WITHDRAW_REASON_WORDS
		);
	});

	it('… and in the API, which takes exactly the limit', async () => {
		const id = ids['gamma lattice'];
		const url = `http://localhost/api/v1/claims/${id}/withdraw`;
		const send = (reason: string) =>
			withdrawApi.POST(
				event(url, {
					params: { id },
					request: new Request(url, {
						method: 'POST',
						headers: { 'content-type': 'application/json' },
						body: JSON.stringify({ reason })
					})
				})
			);
		const refused = await send(tooLong);
		expect(refused.status).toBe(400);
		expect(((await refused.json()) as { error: { message: string } }).error.message).toContain(
			WITHDRAW_REASON_WORDS
		);
		const longest = await send('w'.repeat(WITHDRAW_REASON.max));
		expect(longest.status).toBe(200);
	});
});

describe('the origin of links in mail', () => {
	it('is ORIGIN for every service that writes a link', async () => {
		const { database } = await app();
		await requestPasswordReset(database, 'nobody@halvorsen.test');
		const input = { email: 'tove.aas@halvorsen.test', role: 'author' as const };
		await inviteMember(database, actor() as never, groupId, input);
		const rows = await database.models.OutboxMail.findAll();
		const links = rows.flatMap((r) => (r.get('text') as string).match(/https?:\/\/\S+/g) ?? []);
		expect(links.length).toBeGreaterThanOrEqual(2);
		expect(links.filter((link) => !link.startsWith(`${ORIGIN}/`))).toEqual([]);
	});
});
