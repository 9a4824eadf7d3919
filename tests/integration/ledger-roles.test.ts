/**
 * The public ledger names who withdrew a certificate by role, never by account (issue 16 part 5):
 * a new withdraw entry records the role it is signed with; an entry written before that (the
 * account's id as `details.by`) is shown with the role in its place and says so, while its stored
 * payload, hash and signature stay as signed and `verifyLedger` (npm run ledger:verify) passes.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
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
