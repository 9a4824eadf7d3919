/**
 * Issue 15 part 4: each new signing key is introduced on the ledger by an entry signed with the
 * key before it (`keys:rotate`, or the next ledger entry after a rotation the ledger missed),
 * carrying the new public key and the new key's own signature; ledger:verify checks that chain.
 * The signatures are also checked here with Node's own Ed25519, outside the project's code.
 */
import { spawnSync } from 'node:child_process';
import { createPublicKey, verify } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { canonicalJson } from '../../src/lib/evidence/canonical';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { newSigningKey, signText, type SigningKey } from '../../src/lib/evidence/signing';
import { writeTransaction } from '../../src/lib/server/db';
import {
	publishedKeys,
	rotateServiceKey,
	storedSigningKey
} from '../../src/lib/server/evidence/keys';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { introduceKeys, introductionText } from '../../src/lib/server/ledger/key-introductions';
import { appendEntry } from '../../src/lib/server/ledger/ledger-append';
import { verifyLedger } from '../../src/lib/server/ledger/ledger-verify';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for bundling, issuing and Node child processes on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 900_000, hookTimeout: 600_000 });

let world: EvidenceWorld;

const sql = (query: string, replacements: Record<string, unknown> = {}) =>
	world.database.sequelize.query(query, { replacements, type: QueryTypes.RAW });

const cli = (name: string) => {
	const run = spawnSync(process.execPath, ['scripts/cli.mjs', name], {
		encoding: 'utf8',
		env: { ...process.env }
	});
	return { status: run.status, out: run.stdout + run.stderr };
};

const entries = async () =>
	(await world.database.models.LedgerEntry.findAll({ order: [['seq', 'ASC']] })).map((r) =>
		r.get({ plain: true })
	);

const issue = async (seed: number) =>
	issueCertificate(
		world.database,
		world.author,
		world.claimId,
		(await finishedCheck(world, seed)).id
	);

/** Ed25519 by Node's crypto, the raw key wrapped as SPKI DER (RFC 8410 §4). */
function nodeVerifies(text: string, signatureHex: string, publicKeyHex: string): boolean {
	const der = Buffer.concat([
		Buffer.from('302a300506032b6570032100', 'hex'),
		Buffer.from(publicKeyHex, 'hex')
	]);
	const key = createPublicKey({ key: der, format: 'der', type: 'spki' });
	return verify(null, Buffer.from(text), key, Buffer.from(signatureHex, 'hex'));
}

/** Replaces the newest entry by `payload` signed with `signer`, checks, then puts it back. */
async function withNewestReplaced(
	payload: Record<string, unknown>,
	signer: SigningKey,
	check: () => Promise<void>
) {
	const all = await entries();
	const row = all.at(-1)!;
	const text = canonicalJson({ ...JSON.parse(row.payload), ...payload, keyId: signer.id });
	const forged = { text, hash: sha256Hex(text), sig: signText(text, signer.secretKey) };
	const update =
		'UPDATE ledger_entries SET payload = :text, hash = :hash, signature = :sig, key_id = :key WHERE seq = :seq';
	await sql(update, { ...forged, key: signer.id, seq: row.seq });
	try {
		await check();
	} finally {
		await sql(update, {
			text: row.payload,
			hash: row.hash,
			sig: row.signature,
			key: row.keyId,
			seq: row.seq
		});
	}
}

beforeAll(async () => {
	world = await evidenceWorld();
	const scratch = world.ctx.folder;
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(scratch, 'verify.mjs'));
	process.env.DATABASE_PATH = path.join(world.ctx.folder, 'rankseal.sqlite');
	await issue(61);
});
afterAll(async () => {
	delete process.env.DATABASE_PATH;
	await world.ctx.close();
});

describe('key introductions', () => {
	it('keys:rotate introduces the new key by an entry signed with the previous one', async () => {
		const [first] = publishedKeys();
		const run = cli('keys-rotate');
		expect(run.status, run.out).toBe(0);
		expect(run.out).toMatch(/introduced on the ledger \(entry 2\), signed with the previous key/);
		const second = publishedKeys()[1];
		const entry = (await entries())[1];
		expect(entry).toMatchObject({ seq: 2, event: 'key', certificateId: null, keyId: first.id });
		const payload = JSON.parse(entry.payload);
		expect(payload.details).toMatchObject({
			introduces: second.id,
			publicKey: second.publicKey,
			previousKeyId: first.id
		});
		// The old key signed the entry; the new key signed its own introduction.
		expect(nodeVerifies(entry.payload, entry.signature, first.publicKey)).toBe(true);
		expect(
			nodeVerifies(introductionText(payload.details), payload.details.proof, second.publicKey)
		).toBe(true);
		expect(sha256Hex(Buffer.from(second.publicKey, 'hex'))).toBe(second.id);
	});

	it('introduces a key rotated behind the ledger’s back before the next entry it signs', async () => {
		rotateServiceKey();
		await issue(62);
		const all = await entries();
		const keys = publishedKeys();
		expect(all.map((e) => [e.event, e.keyId])).toEqual([
			['issue', keys[0].id],
			['key', keys[0].id],
			['key', keys[1].id],
			['issue', keys[2].id],
			['supersede', keys[2].id]
		]);
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true, entries: 5 });
		expect(cli('ledger-verify')).toMatchObject({ status: 0 });
	});
});

describe('a broken chain of keys is named by ledger:verify', () => {
	beforeAll(async () => {
		// The newest entry is an introduction: keys:rotate once more.
		expect(cli('keys-rotate').status).toBe(0);
	});

	it('an introduction signed with the new key itself instead of the previous one', async () => {
		const newest = storedSigningKey(publishedKeys().at(-1)!.id);
		await withNewestReplaced({}, newest, async () => {
			expect(await verifyLedger(world.database)).toMatchObject({
				valid: false,
				firstBroken: 'ledger entry 6',
				problem: expect.stringMatching(/not signed with the previous key/)
			});
		});
	});

	it('an introduction of a key the service never listed, signed by an insider with the previous key', async () => {
		const keys = publishedKeys();
		const previous = storedSigningKey(keys.at(-2)!.id);
		const stranger = newSigningKey();
		const details = {
			introduces: stranger.id,
			publicKey: stranger.publicKey,
			previousKeyId: previous.id
		};
		const proof = signText(introductionText(details), stranger.secretKey);
		await withNewestReplaced({ details: { ...details, proof } }, previous, async () => {
			const report = await verifyLedger(world.database);
			expect(report).toMatchObject({ valid: false, firstBroken: 'ledger entry 6' });
			expect(report.problem).toMatch(/is not on the service's key list/);
		});
	});

	it('an introduction whose proof the new key did not make', async () => {
		const keys = publishedKeys();
		const previous = storedSigningKey(keys.at(-2)!.id);
		const details = JSON.parse((await entries()).at(-1)!.payload).details;
		const proof = signText(introductionText(details), previous.secretKey);
		await withNewestReplaced({ details: { ...details, proof } }, previous, async () => {
			expect((await verifyLedger(world.database)).problem).toMatch(
				/did not sign its own introduction/
			);
		});
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true });
	});

	it('an entry signed with a key no earlier entry introduces', async () => {
		const rotated = rotateServiceKey();
		const key = storedSigningKey(rotated.id);
		const event = {
			event: 'withdraw' as const,
			certificateId: (await entries())[0].certificateId!,
			details: { reason: 'old-style entry' }
		};
		// Written as the ledger was written before key entries: no introduction first.
		await writeTransaction(world.database, (t) => appendEntry(world.database, event, key, t));
		expect(await verifyLedger(world.database)).toMatchObject({
			valid: false,
			firstBroken: 'ledger entry 7',
			problem: `signed with key ${rotated.id}, which no earlier entry introduces`
		});
		await sql('DELETE FROM ledger_entries WHERE seq = 7');
	});
});

describe('a ledger written before key entries existed, with a rotation', () => {
	it('fails until the keys are introduced (as app start does), then passes', async () => {
		const old = await evidenceWorld();
		try {
			process.env.DATABASE_PATH = path.join(old.ctx.folder, 'rankseal.sqlite');
			const check = await finishedCheck(old, 63);
			const cert = await issueCertificate(old.database, old.author, old.claimId, check.id);
			const rotated = rotateServiceKey();
			// The way the ledger was written before: an entry signed with the new key, no introduction.
			const event = {
				event: 'withdraw' as const,
				certificateId: cert.id,
				details: { reason: 'old' }
			};
			const key = storedSigningKey(rotated.id);
			await writeTransaction(old.database, (t) => appendEntry(old.database, event, key, t));
			await old.database.models.Certificate.update(
				{ status: 'withdrawn' },
				{ where: { id: cert.id } }
			);
			expect(await verifyLedger(old.database)).toMatchObject({
				valid: false,
				firstBroken: 'ledger entry 2',
				problem: `signed with key ${rotated.id}, which the ledger never introduces`
			});
			const introduced = await writeTransaction(old.database, (t) =>
				introduceKeys(old.database, t)
			);
			expect(introduced.map((k) => k.id)).toEqual([rotated.id]);
			expect(await verifyLedger(old.database)).toMatchObject({ valid: true, entries: 3 });
		} finally {
			process.env.DATABASE_PATH = path.join(world.ctx.folder, 'rankseal.sqlite');
			process.env.RANKSEAL_DATA_DIR = world.ctx.folder;
			await old.ctx.close();
		}
	});
});
