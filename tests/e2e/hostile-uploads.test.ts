/**
 * A seeded hundred of the generated malformed counts files (tests/integration/hostile-counts.ts)
 * sent to the built app over HTTP, through the API (raw CSV, raw JSON, multipart, wrong types)
 * and the claim page's upload form: each gets a 4xx saying where the problem is, never a 5xx, and
 * no dataset row or stored file appears.
 */
import { existsSync, readdirSync } from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BASES, D, hostileCounts, NAMES_THE_PLACE } from '../integration/hostile-counts';
import { seedApiWorld, type ApiWorld } from './api-world';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: ApiWorld;
let claimId: string;

const bearer = () => ({ authorization: `Bearer ${world.tokens.lake}` });

function storedFiles(): string[] {
	const root = path.join(world.dataDir, 'files');
	if (!existsSync(root)) return [];
	return readdirSync(root, { recursive: true, encoding: 'utf8' }).sort();
}

async function datasetCount(): Promise<number> {
	const listed = await fetch(`${app.origin}/api/v1/claims/${claimId}/datasets`, {
		headers: bearer()
	});
	return ((await listed.json()) as unknown[]).length;
}

beforeAll(async () => {
	world = await seedApiWorld();
	app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir });
	const claim = {
		...{ title: 'Hostile uploads', sourceDescription: 'Simulated.', dimension: D },
		...{ method: 'mub-correlation', bases: BASES, claimedSchmidtNumber: 3 }
	};
	const made = await fetch(`${app.origin}/api/v1/claims`, {
		method: 'POST',
		headers: { ...bearer(), 'content-type': 'application/json' },
		body: JSON.stringify(claim)
	});
	expect(made.status).toBe(201);
	claimId = (await made.json()).id;
}, 300_000);

afterAll(async () => {
	await app?.stop();
});

/** How each file is sent: the three accepted forms, and three the API does not take. */
const WAYS = ['text/csv', 'application/json', 'multipart', 'text/plain', 'image/png', 'none'];

function request(bytes: Uint8Array, way: string): RequestInit {
	const headers: Record<string, string> = bearer();
	if (way === 'multipart') {
		const body = new FormData();
		body.append('counts', new File([Uint8Array.from(bytes)], 'hostile.csv'));
		return { method: 'POST', headers, body };
	}
	if (way !== 'none') headers['content-type'] = way;
	return { method: 'POST', headers, body: Uint8Array.from(bytes) };
}

describe('hostile counts files over HTTP', () => {
	it('answers each of 100 with a 4xx that says where, and stores nothing', async () => {
		const before = { rows: await datasetCount(), files: storedFiles() };
		const cases = fc.sample(fc.tuple(hostileCounts, fc.constantFrom(...WAYS)), {
			numRuns: 100,
			seed: 1202
		});
		for (const [{ kind, bytes }, way] of cases) {
			const url = `${app.origin}/api/v1/claims/${claimId}/datasets`;
			const response = await fetch(url, request(bytes, way));
			const body = await response.json();
			const label = `${kind} as ${way}: ${response.status} ${JSON.stringify(body)}`;
			if (['text/csv', 'application/json', 'multipart'].includes(way)) {
				expect(response.status, label).toBe(400);
				expect(body.error?.message, label).toMatch(NAMES_THE_PLACE);
			} else {
				expect(response.status, label).toBe(415);
				expect(body.error?.message, label).toMatch(
					/multipart\/form-data .*text\/csv .*application\/json/
				);
			}
		}
		expect(await datasetCount()).toBe(before.rows);
		expect(storedFiles()).toEqual(before.files);
	}, 600_000);

	it('answers the page form the same way: 400 with the message shown, nothing stored', async () => {
		const before = { rows: await datasetCount(), files: storedFiles() };
		const cookie = `rankseal_session=${world.session}`;
		for (const { kind, bytes } of fc.sample(hostileCounts, { numRuns: 20, seed: 31 })) {
			const body = new FormData();
			body.append('counts', new File([Uint8Array.from(bytes)], 'hostile.csv'));
			const response = await fetch(`${app.origin}/claims/${claimId}?/upload`, {
				method: 'POST',
				headers: { cookie, origin: app.origin, accept: 'text/html' },
				body,
				redirect: 'manual'
			});
			const page = await response.text();
			expect(response.status, `${kind}: ${response.headers.get('location')}`).toBe(400);
			// The refusal, escaped as the page shows it: "line 7, column 4: …" or "the file …".
			expect(page, kind).toMatch(/line \d+(, column \d+)?: |the (file|JSON) /);
		}
		expect(await datasetCount()).toBe(before.rows);
		expect(storedFiles()).toEqual(before.files);
	}, 600_000);
});
