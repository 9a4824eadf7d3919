/**
 * Certificates through the JSON API of the built app: issuing, reading, the PDF and the bundle
 * (whose own verify.mjs passes), superseding, 404 for another group, 401 without credentials,
 * and the public signing keys, ledger and verification page.
 */
import { spawnSync } from 'node:child_process';
import { createHash, createPublicKey, verify } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedApiWorld, type ApiWorld } from './api-world';
import { addFinishedClaims, type FinishedClaim } from './certificate-world';
import { startApp, type AppServer } from './server';

let app: AppServer;
let world: ApiWorld;
let claims: FinishedClaim[];
const folder = mkdtempSync(path.join(tmpdir(), 'rankseal-api-cert-'));
const issued: { id: string; fingerprint: string; keyId: string }[] = [];
const sha256 = (data: string | Uint8Array) => createHash('sha256').update(data).digest('hex');

function call(route: string, init: RequestInit & { token?: string | null } = {}) {
	const headers = new Headers(init.headers);
	const token = init.token === undefined ? world.tokens.lake : init.token;
	if (token) headers.set('authorization', `Bearer ${token}`);
	return fetch(app.origin + route, { ...init, headers });
}
const issue = (claim: FinishedClaim, body: unknown = { checkId: claim.checkId }, token?: string) =>
	call(`/api/v1/claims/${claim.claimId}/certificates`, {
		method: 'POST',
		token,
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify(body)
	});

beforeAll(async () => {
	world = await seedApiWorld();
	claims = await addFinishedClaims(world.dataDir, 1);
	app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir, RANKSEAL_DEMO: '0' });
});
afterAll(async () => {
	await app?.stop();
	if (world) rmSync(world.dataDir, { recursive: true, force: true });
	rmSync(folder, { recursive: true, force: true });
});

describe('certificates in the API', () => {
	it('issues (201) a certificate whose record, PDF and bundle can be fetched', async () => {
		const response = await issue(claims[0]);
		expect(response.status, await response.clone().text()).toBe(201);
		const certificate = await response.json();
		const { id } = certificate;
		expect(certificate).toMatchObject({
			status: 'valid',
			supersedes: null,
			urls: {
				pdf: `/api/v1/certificates/${id}/pdf`,
				bundle: `/api/v1/certificates/${id}/bundle`,
				verify: `/seal/${id}`
			}
		});
		expect(certificate.fingerprint).toMatch(/^[0-9a-f]{64}$/);
		expect(response.headers.get('location')).toBe(`/api/v1/certificates/${id}`);
		const again = await (await call(`/api/v1/certificates/${id}`)).json();
		// Issue 21: the same DOI; its registration may have moved on meanwhile (background sender).
		expect({ ...again, doi: null }).toEqual({ ...certificate, doi: null });
		expect(again.doi.doi).toBe(certificate.doi.doi);
		expect(['pending', 'registered']).toContain(certificate.doi.registration);
		// Issue 15: how many analyses of these counts came before it, and whether it is the declared one.
		expect(certificate.analyses).toMatchObject({ total: expect.any(Number), declared: true });
		expect(certificate.analyses.total).toBeGreaterThanOrEqual(1);
		issued.push(certificate);
	});

	it('serves the PDF, whose text holds the ID, the fingerprint and the verification page', async () => {
		const [{ id, fingerprint }] = issued;
		const response = await call(`/api/v1/certificates/${id}/pdf`);
		expect(response.headers.get('content-type')).toBe('application/pdf');
		const file = path.join(folder, 'certificate.pdf');
		writeFileSync(file, new Uint8Array(await response.arrayBuffer()));
		const text = spawnSync('pdftotext', ['-raw', file, '-'], { encoding: 'utf8' }).stdout;
		const flat = text.replace(/\s+/g, '');
		expect(flat).toContain(id);
		expect(flat).toContain(fingerprint);
		// The QR code is drawn from the same address the PDF prints under "Verify at".
		expect(flat).toContain(`${app.origin}/seal/${id}`);
		const page = await fetch(`${app.origin}/seal/${id}`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain(fingerprint);
		expect(html).toMatch(/data-status="valid"/);
	});

	it('serves the bundle, and the verify.mjs inside it passes offline', async () => {
		const [{ id }] = issued;
		const response = await call(`/api/v1/certificates/${id}/bundle`);
		expect(response.headers.get('content-type')).toBe('application/zip');
		const bytes = new Uint8Array(await response.arrayBuffer());
		// A zip starts with a local file header, signature 0x04034b50 (PKWARE APPNOTE.TXT §4.3.7).
		expect([...bytes.subarray(0, 4)]).toEqual([0x50, 0x4b, 0x03, 0x04]);
		const zip = path.join(folder, 'bundle.zip');
		writeFileSync(zip, bytes);
		spawnSync('unzip', ['-q', '-o', zip, '-d', folder]);
		const cwd = path.join(folder, `rankseal-${id}`);
		const alone = spawnSync(process.execPath, ['verify.mjs'], { cwd, encoding: 'utf8' });
		// Without a key list from outside the bundle: valid, but the key is not anchored (exit 3).
		expect(alone.status, alone.stdout + alone.stderr).toBe(3);
		expect(alone.stdout).toMatch(/^NOT ANCHORED/m);
		const keys = path.join(folder, 'keys.json');
		writeFileSync(keys, await (await call('/api/v1/signing-keys', { token: null })).text());
		const run = spawnSync(process.execPath, ['verify.mjs', '--keys', keys], {
			cwd,
			encoding: 'utf8'
		});
		expect(run.status, run.stdout + run.stderr).toBe(0);
		expect(run.stdout).toMatch(/^PASS/m);
	});

	it('supersedes: the newer one names the older, the older is marked and linked back', async () => {
		const response = await issue(claims[0]);
		expect(response.status).toBe(201);
		const second = await response.json();
		expect(second.supersedes).toBe(issued[0].id);
		const first = await (await call(`/api/v1/certificates/${issued[0].id}`)).json();
		expect(first).toMatchObject({ status: 'superseded', supersededBy: second.id });
		const listed = await (await call(`/api/v1/claims/${claims[0].claimId}/certificates`)).json();
		expect(listed.map((c: { id: string }) => c.id)).toEqual([second.id, first.id]);
		issued.push(second);
	});

	it('answers 404 to another group and 401 without credentials, files included', async () => {
		const [{ id }] = issued;
		const routes = [`/api/v1/certificates/${id}`, `/api/v1/certificates/${id}/pdf`];
		routes.push(
			`/api/v1/certificates/${id}/bundle`,
			`/api/v1/claims/${claims[0].claimId}/certificates`
		);
		for (const route of routes) {
			const foreign = await call(route, { token: world.tokens.ridge });
			expect(foreign.status, route).toBe(404);
			expect((await foreign.json()).error.code).toBe('not_found');
			const anonymous = await call(route, { token: null });
			expect(anonymous.status, route).toBe(401);
			expect((await anonymous.json()).error.code).toBe('unauthorised');
		}
		const foreignIssue = await issue(claims[0], undefined, world.tokens.ridge);
		expect(foreignIssue.status).toBe(404);
	});

	it('refuses a body without checkId (400, naming it) and an unknown check (404)', async () => {
		const bad = await issue(claims[0], {});
		expect(bad.status).toBe(400);
		expect((await bad.json()).error).toMatchObject({ code: 'bad_input', field: 'checkId' });
		expect((await issue(claims[0], { checkId: 'no-such-check' })).status).toBe(404);
	});

	it('publishes the signing keys without sign-in; each id is the SHA-256 of its public key', async () => {
		const response = await call('/api/v1/signing-keys', { token: null });
		expect(response.status).toBe(200);
		const { keys } = await response.json();
		for (const key of keys) {
			expect(key.algorithm).toBe('Ed25519');
			expect(key.id).toBe(sha256(Buffer.from(key.publicKey, 'hex')));
		}
		expect(keys.map((k: { id: string }) => k.id)).toContain(issued[0].keyId);
	});

	it('lists the ledger without sign-in, paged, each entry chained to the one before', async () => {
		const response = await call('/api/v1/ledger?pageSize=200', { token: null });
		expect(response.status).toBe(200);
		const ledger = await response.json();
		expect(ledger.items.map((e: { event: string }) => e.event)).toEqual([
			'issue',
			'issue',
			'supersede'
		]);
		let previous = '0'.repeat(64);
		for (const entry of ledger.items) {
			expect(entry.prevHash).toBe(previous);
			expect(entry.hash).toBe(sha256(entry.payload));
			previous = entry.hash;
		}
		const second = await (await call('/api/v1/ledger?pageSize=1&page=2', { token: null })).json();
		expect(second).toMatchObject({ total: 3, page: 2, pageSize: 1 });
		expect(second.items).toEqual([ledger.items[1]]);
		const bad = await call('/api/v1/ledger?pageSize=0', { token: null });
		expect(bad.status).toBe(400);
		expect((await bad.json()).error.code).toBe('bad_input');
	});

	it('signs a checkpoint of the ledger without sign-in: entry count, head hash, time', async () => {
		const checkpoint = await (await call('/api/v1/ledger/checkpoint', { token: null })).json();
		const ledger = await (await call('/api/v1/ledger?pageSize=200', { token: null })).json();
		expect(checkpoint).toMatchObject({
			format: 'rankseal-checkpoint/1',
			entries: ledger.total,
			head: ledger.items.at(-1).hash
		});
		const { keys } = await (await call('/api/v1/signing-keys', { token: null })).json();
		const key = keys.find((k: { id: string }) => k.id === checkpoint.keyId);
		// Checked with Node's own Ed25519 (RFC 8032), the key wrapped as SPKI DER (RFC 8410 §4).
		const spki = Buffer.concat([
			Buffer.from('302a300506032b6570032100', 'hex'),
			Buffer.from(key.publicKey, 'hex')
		]);
		const publicKey = createPublicKey({ key: spki, format: 'der', type: 'spki' });
		const { at, entries, format, head, keyId } = checkpoint;
		// These five plain values in sorted order are their RFC 8785 form.
		const signed = Buffer.from(JSON.stringify({ at, entries, format, head, keyId }));
		const signature = Buffer.from(checkpoint.signature, 'hex');
		expect(verify(null, signed, publicKey, signature)).toBe(true);
		const shifted = JSON.stringify({ at, entries: entries + 1, format, head, keyId });
		expect(verify(null, Buffer.from(shifted), publicKey, signature)).toBe(false);
	});
});
