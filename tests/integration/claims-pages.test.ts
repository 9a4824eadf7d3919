/**
 * The claim pages' loads and form actions against a real SQLite file: what a browser without
 * JavaScript gets (fail(400) with errors and values, or a 303), and 404 outside the group.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { isActionFailure, isHttpError, isRedirect } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addGroup, addUser, countsCsv } from './backend-fixtures';

const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-claims-pages-'));
process.env.RANKSEAL_DATA_DIR = folder;
process.env.MAIL_CATCHER_PORT = '0';

const { app } = await import('../../src/lib/server/app/app');
const { closeDb } = await import('../../src/lib/server/db');
const newClaim = await import('../../src/routes/(app)/claims/new/+page.server');
const claimPage = await import('../../src/routes/(app)/claims/[id]/+page.server');
const claimList = await import('../../src/routes/(app)/claims/+page.server');

let ada: string, ben: string, unverified: string;

function user(id: string, emailVerified = true) {
	return { id, email: `${id}@example.test`, name: id, accountRole: 'researcher', emailVerified };
}

const actor = (userId: string | null) =>
	userId
		? { kind: 'user', userId, accountRole: 'researcher', emailVerified: userId !== unverified }
		: { kind: 'anonymous' };

function post(url: string, fields: Record<string, string | File>) {
	const form = new FormData();
	for (const [key, value] of Object.entries(fields)) form.set(key, value);
	return new Request(url, { method: 'POST', body: form });
}

/** Runs an action or load and returns what it returned or threw. */
async function outcome(run: () => unknown): Promise<unknown> {
	try {
		return await run();
	} catch (thrown) {
		return thrown;
	}
}

// The handlers only read these fields of the request event.
function event(userId: string | null, url: string, extra: Record<string, unknown> = {}) {
	const locals = {
		actor: actor(userId),
		user: userId ? user(userId, userId !== unverified) : null,
		session: null
	};
	return { locals, url: new URL(url), params: {}, ...extra } as never;
}

const claimFields = {
	title: 'Time-bin pairs, page test',
	sourceDescription: 'Simulated isotropic source',
	dimension: '5',
	method: 'mub-correlation',
	bases: '0,1',
	claimedSchmidtNumber: '3'
};

async function createClaim(userId: string): Promise<string> {
	const url = 'http://localhost/claims/new?/create';
	const result = await outcome(() =>
		newClaim.actions.create(event(userId, url, { request: post(url, claimFields) }))
	);
	if (!isRedirect(result)) throw new Error(`expected a redirect, got ${JSON.stringify(result)}`);
	return result.location.split('/').at(-1)!;
}

beforeAll(async () => {
	const { database } = await app();
	const lake = await addGroup(database, 'Lake optics');
	const ridge = await addGroup(database, 'Ridge qudits');
	ada = await addUser(database, 'Ada Lind', [[lake, 'lead']]);
	ben = await addUser(database, 'Ben Osei', [[ridge, 'author']]);
	unverified = await addUser(database, 'Una Vale', [[lake, 'author']]);
});

afterAll(async () => {
	const services = await app();
	await services.mailCatcher?.close();
	await closeDb();
	rmSync(folder, { recursive: true, force: true });
});

describe('new claim form', () => {
	const url = 'http://localhost/claims/new?/create';

	it('answers bad input with fail(400), the field errors and the values', async () => {
		const request = post(url, { ...claimFields, claimedSchmidtNumber: '9', bases: '0,1,9' });
		const result = await outcome(() => newClaim.actions.create(event(ada, url, { request })));
		expect(isActionFailure(result)).toBe(true);
		const failure = result as {
			status: number;
			data: { errors: Record<string, string>; values: Record<string, string> };
		};
		expect(failure.status).toBe(400);
		expect(failure.data.errors.claimedSchmidtNumber).toMatch(/cannot exceed the dimension/);
		expect(failure.data.errors.bases).toMatch(/Basis 9 does not exist/);
		expect(failure.data.values.title).toBe(claimFields.title);
	});

	it('refuses an unconfirmed address and creates nothing', async () => {
		const request = post(url, claimFields);
		const result = await outcome(() =>
			newClaim.actions.create(event(unverified, url, { request }))
		);
		expect(isActionFailure(result) && result.status).toBe(403);
	});

	it('creates the claim and redirects to its page with 303', async () => {
		const id = await createClaim(ada);
		expect(id).toMatch(/^[0-9a-f-]{36}$/);
	});
});

describe('claim page', () => {
	let claimId: string;
	const at = (query = '') => `http://localhost/claims/${claimId}${query}`;
	const upload = (name: string, text: string) =>
		claimPage.actions.upload(
			event(ada, at('?/upload'), {
				params: { id: claimId },
				request: post(at('?/upload'), { counts: new File([text], name, { type: 'text/csv' }) })
			})
		);

	beforeAll(async () => {
		claimId = await createClaim(ada);
	});

	it('shows a bad file’s line and column, and stores nothing', async () => {
		const bad = 'basis,outcome_a,outcome_b,counts\n0,0,0,10\n0,0,x,3\n';
		const result = await outcome(() => upload('bad.csv', bad));
		expect(isActionFailure(result)).toBe(true);
		const { data } = result as {
			data: { action: string; errors: Record<string, string>; values: Record<string, string> };
		};
		expect(data).toMatchObject({
			action: 'upload',
			place: { line: 3, column: 3 },
			values: { counts: 'bad.csv' }
		});
		expect(data.errors.counts).toMatch(/^line 3, column 3: /);
		const page = (await claimPage.load(event(ada, at(), { params: { id: claimId } }))) as {
			datasets: unknown[];
		};
		expect(page.datasets).toHaveLength(0);
	});

	it('stores a good file and previews its tables', async () => {
		const result = await outcome(() => upload('run3.csv', countsCsv(5, [0, 1])));
		expect(isRedirect(result) && result.status).toBe(303);
		const location = (result as { location: string }).location;
		expect(location).toMatch(new RegExp(`^/claims/${claimId}\\?dataset=`));
		const page = (await claimPage.load(
			event(ada, `http://localhost${location}`, { params: { id: claimId } })
		)) as {
			preview: {
				tables: { basis: number; counts: number[][] }[];
				dataset: { summary: { allows: string[] } };
			};
		};
		expect(page.preview.tables.map((t) => t.basis)).toEqual([0, 1]);
		expect(page.preview.tables[0].counts).toHaveLength(5);
		expect(page.preview.dataset.summary.allows).toContain('mub-correlation');
	});

	it('checks the run settings before starting a check', async () => {
		const request = post(at('?/check'), { resamples: '5', confidence: '0.99865', seed: '1' });
		const result = await outcome(() =>
			claimPage.actions.check(event(ada, at('?/check'), { params: { id: claimId }, request }))
		);
		expect(isActionFailure(result) && result.status).toBe(400);
		expect((result as { data: { errors: Record<string, string> } }).data.errors.resamples).toMatch(
			/at least 100/
		);
	});

	it('is not found for someone outside the group, in the load and in the actions', async () => {
		const load = await outcome(() => claimPage.load(event(ben, at(), { params: { id: claimId } })));
		expect(isHttpError(load) && load.status).toBe(404);
		const request = post(at('?/upload'), { counts: new File([countsCsv(5, [0, 1])], 'x.csv') });
		const action = await outcome(() =>
			claimPage.actions.upload(event(ben, at('?/upload'), { params: { id: claimId }, request }))
		);
		expect(isHttpError(action) && action.status).toBe(404);
	});
});

describe('claims list', () => {
	it('renders the first page on the server, sorted as the address asks', async () => {
		const page = (await claimList.load(
			event(ada, 'http://localhost/claims?sort=title&order=asc')
		)) as {
			query: { sort: string; order: string };
			listing: { items: { title: string }[]; total: number };
		};
		expect(page.query).toMatchObject({ sort: 'title', order: 'asc', page: 1 });
		expect(page.listing.total).toBeGreaterThanOrEqual(2);
		const other = (await claimList.load(event(ben, 'http://localhost/claims'))) as {
			listing: { total: number };
		};
		expect(other.listing.total).toBe(0);
	});
});
