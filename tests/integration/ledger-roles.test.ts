/**
 * The public ledger names who withdrew or issued a certificate by role, never by account (issue 16
 * part 5): a new entry records the role it is signed with (an issue entry also a salted digest of
 * the issuer's account id, which `verifyLedger` binds to the certificate row); an entry written
 * before that (the account's id as `details.by` or `details.issuedBy`) is shown with the role in
 * its place and says so, while its stored payload, hash and signature stay as signed and
 * `verifyLedger` (npm run ledger:verify) passes.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { canonicalJson } from '../../src/lib/evidence/canonical';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { signText } from '../../src/lib/evidence/signing';
import { serviceKey } from '../../src/lib/server/evidence/keys';
import { writeTransaction } from '../../src/lib/server/db/transactions';
import { withdrawCertificate } from '../../src/lib/server/certificates/certificate-withdraw';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { appendLedger } from '../../src/lib/server/ledger/ledger';
import { publicLedgerPage } from '../../src/lib/server/ledger/ledger-roles';
import { verifyLedger } from '../../src/lib/server/ledger/ledger-verify';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for issuing on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
beforeAll(async () => (world = await evidenceWorld()));
afterAll(async () => world?.ctx.close());

const withdrawEntries = async () =>
	(await publicLedgerPage(world.database, 1, 200)).items.filter((e) => e.event === 'withdraw');

describe('a withdrawal on the public ledger', () => {
	it('names the group lead by role in what is signed, and no account anywhere', async () => {
		const check = await finishedCheck(world, 41);
		const certificate = await issueCertificate(
			world.database,
			world.author,
			world.claimId,
			check.id
		);
		await withdrawCertificate(world.database, world.lead, certificate.id, 'Counts mislabelled.');
		const [entry] = await withdrawEntries();
		expect(JSON.parse(entry.payload).details).toEqual({
			reason: 'Counts mislabelled.',
			byRole: 'group lead'
		});
		expect(entry.redacted).toEqual([]);
		// The lead issued nothing here, so no entry of the page may name their account.
		const page = JSON.stringify(await publicLedgerPage(world.database, 1, 200));
		expect(page).not.toContain(world.lead.userId);
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true });
	});

	it('shows an entry written before the change by role, marked, with the chain still whole', async () => {
		const check = await finishedCheck(world, 42);
		const certificate = await issueCertificate(
			world.database,
			world.author,
			world.claimId,
			check.id
		);
		// What the old code wrote: the withdrawer's account id, signed into the payload.
		await writeTransaction(world.database, async (transaction) => {
			await world.database.models.Certificate.update(
				{ status: 'withdrawn' },
				{ where: { id: certificate.id }, transaction }
			);
			const details = { reason: 'Old reason.', by: world.author.userId };
			const event = { event: 'withdraw' as const, certificateId: certificate.id, details };
			await appendLedger(world.database, event, serviceKey(), transaction);
		});
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true });
		const old = (await withdrawEntries()).at(-1)!;
		expect(JSON.parse(old.payload).details).toEqual({ reason: 'Old reason.', byRole: 'author' });
		expect(old.redacted).toEqual(['details.by']);
		expect(JSON.stringify(await withdrawEntries())).not.toContain(world.author.userId);
		const page = await publicLedgerPage(world.database, 1, 200);
		// The hashes still chain: each entry names the one before it.
		for (let i = 1; i < page.items.length; i++)
			expect(page.items[i].prevHash).toBe(page.items[i - 1].hash);
	});
});

const issueEntries = async () =>
	(await publicLedgerPage(world.database, 1, 200)).items.filter((e) => e.event === 'issue');

describe('an issue on the public ledger', () => {
	it('names the issuer by role and binds the account by a salted digest, never the id', async () => {
		const [first, second] = [await finishedCheck(world, 43), await finishedCheck(world, 44)];
		for (const check of [first, second])
			await issueCertificate(world.database, world.author, world.claimId, check.id);
		const [a, b] = (await issueEntries()).slice(-2).map((e) => {
			expect(e.redacted).toEqual([]);
			return JSON.parse(e.payload).details;
		});
		for (const details of [a, b]) {
			expect(details).not.toHaveProperty('issuedBy');
			expect(details.issuerRole).toBe('author');
			expect(details.issuerSalt).toMatch(/^[0-9a-f]{32}$/);
			// SHA-256 (FIPS 180-4) of the documented preimage, computed here from its parts.
			expect(details.issuerDigest).toBe(
				sha256Hex(`rankseal-issuer:${details.issuerSalt}:${world.author.userId}`)
			);
		}
		// Two issues by one account: nothing in the entries matches them to each other.
		expect(a.issuerSalt).not.toBe(b.issuerSalt);
		expect(a.issuerDigest).not.toBe(b.issuerDigest);
		const page = JSON.stringify(await publicLedgerPage(world.database, 1, 200));
		expect(page).not.toContain(world.author.userId);
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true });
	});

	it('lets ledger:verify catch a certificate row whose issuer was changed', async () => {
		const [entry] = (await issueEntries()).slice(-1);
		const { Certificate } = world.database.models;
		const where = { where: { id: entry.certificateId! } };
		const issuer = (await Certificate.findOne(where))!.get('issuedBy') as string | null;
		await Certificate.update({ issuedBy: world.lead.userId }, where);
		try {
			const report = await verifyLedger(world.database);
			expect(report.valid).toBe(false);
			expect(JSON.stringify(report)).toMatch(/differs from its signed manifest or ledger entry/);
		} finally {
			await Certificate.update({ issuedBy: issuer }, where);
		}
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true });
	});

	it('shows an entry written before the change by role, marked, and ledger:verify binds its id', async () => {
		const check = await finishedCheck(world, 45);
		const certificate = await issueCertificate(
			world.database,
			world.author,
			world.claimId,
			check.id
		);
		// What the old code wrote: the issuer's account id, signed into the issue entry's payload;
		// the entries after it (the superseding) are chained and signed again onto the new hash.
		const { LedgerEntry } = world.database.models;
		const rows = await LedgerEntry.findAll({ order: [['seq', 'ASC']] });
		const at = rows.findIndex(
			(r) => r.get('event') === 'issue' && r.get('certificateId') === certificate.id
		);
		const stored = JSON.parse(rows[at].get('payload') as string);
		const { issuerRole, issuerSalt, issuerDigest, ...rest } = stored.details;
		expect([issuerRole, issuerSalt.length, issuerDigest.length]).toEqual(['author', 32, 64]);
		let prevHash = stored.prevHash as string;
		for (const row of rows.slice(at)) {
			const body = JSON.parse(row.get('payload') as string);
			const details = row === rows[at] ? { ...rest, issuedBy: world.author.userId } : body.details;
			const payload = canonicalJson({ ...body, prevHash, details });
			const hash = sha256Hex(payload);
			const signature = signText(payload, serviceKey().secretKey);
			await LedgerEntry.update(
				{ payload, prevHash, hash, signature },
				{ where: { seq: row.get('seq') as number } }
			);
			prevHash = hash;
		}
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true });
		const old = (await issueEntries()).at(-1)!;
		expect(old.redacted).toEqual(['details.issuedBy']);
		expect(JSON.parse(old.payload).details).toEqual({ ...rest, issuerRole: 'author' });
		expect(JSON.stringify(await publicLedgerPage(world.database, 1, 200))).not.toContain(
			world.author.userId
		);
	});
});
