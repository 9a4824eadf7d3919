/** The ledger: hand edits of any ledger or certificate row are found, by the service and by `npm run ledger:verify`. */
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { sweepOrphanFiles } from '../../src/lib/server/storage/certificate-store';
import {
	issueCertificate,
	type CertificateView
} from '../../src/lib/server/certificates/certificates';
import { verifyLedger } from '../../src/lib/server/ledger/ledger-verify';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for bundling, issuing and Node child processes on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 900_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let scratch: string;
let first: CertificateView;
let second: CertificateView;
let otherCheck: string;

const sql = (query: string, replacements: Record<string, unknown> = {}) =>
	world.database.sequelize.query(query, { replacements, type: QueryTypes.RAW });

/** Runs `npm run --silent ledger:verify` (its script: the launcher and bundle) against the test's data folder. */
function ledgerCli() {
	const run = spawnSync(process.execPath, ['scripts/cli.mjs', 'ledger-verify'], {
		encoding: 'utf8',
		env: { ...process.env }
	});
	return { status: run.status, out: run.stdout + run.stderr };
}

beforeAll(async () => {
	world = await evidenceWorld();
	scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-ledger-test-'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(scratch, 'verify.mjs'));
	process.env.DATABASE_PATH = path.join(world.ctx.folder, 'rankseal.sqlite');
	first = await issueCertificate(
		world.database,
		world.author,
		world.claimId,
		(await finishedCheck(world, 31)).id
	);
	second = await issueCertificate(
		world.database,
		world.author,
		world.claimId,
		(await finishedCheck(world, 32)).id
	);
	otherCheck = (await finishedCheck(world, 33)).id;
});
afterAll(async () => {
	delete process.env.DATABASE_PATH;
	await world.ctx.close();
	rmSync(scratch, { recursive: true, force: true });
});

/** Applies a hand edit, expects the first broken item, then undoes the edit and expects an intact ledger. */
async function detects(
	edit: string,
	undo: string,
	where: () => string,
	values: Record<string, unknown> = {}
) {
	await sql(edit, values);
	try {
		expect(await verifyLedger(world.database)).toMatchObject({
			valid: false,
			firstBroken: where()
		});
	} finally {
		await sql(undo, values);
	}
	expect(await verifyLedger(world.database)).toMatchObject({ valid: true });
}

describe('ledger verification', () => {
	it('passes the chain as issued, in the service and from the command line', async () => {
		expect(await verifyLedger(world.database)).toEqual({
			valid: true,
			entries: 3,
			certificates: 2,
			firstBroken: null,
			problem: null
		});
		expect(ledgerCli()).toEqual({
			status: 0,
			out: 'ledger intact: 3 ledger entries, 2 certificates.\n'
		});
	});

	it('finds an edited payload, event, hash or date of a ledger entry', async () => {
		await detects(
			`UPDATE ledger_entries SET payload = replace(payload, '"issue"', '"issuE"') WHERE seq = 2`,
			`UPDATE ledger_entries SET payload = replace(payload, '"issuE"', '"issue"') WHERE seq = 2`,
			() => 'ledger entry 2'
		);
		await detects(
			`UPDATE ledger_entries SET event = 'withdraw' WHERE seq = 1`,
			`UPDATE ledger_entries SET event = 'issue' WHERE seq = 1`,
			() => 'ledger entry 1'
		);
		await detects(
			`UPDATE ledger_entries SET created_at = '2001-01-01 00:00:00.000 +00:00' WHERE seq = 3`,
			`UPDATE ledger_entries SET created_at = :at WHERE seq = 3`,
			() => 'ledger entry 3',
			{ at: (await world.database.models.LedgerEntry.findByPk(3))!.get('createdAt') }
		);
	});

	it('finds a re-hashed entry whose signature no longer fits, and a deleted entry', async () => {
		const row = (await world.database.models.LedgerEntry.findByPk(2))!.get({ plain: true });
		const forged = row.payload.replace(row.certificateId!, first.id);
		const { createHash } = await import('node:crypto');
		const hash = createHash('sha256').update(forged).digest('hex');
		await detects(
			`UPDATE ledger_entries SET payload = :forged, hash = :hash, certificate_id = :cid WHERE seq = 2`,
			`UPDATE ledger_entries SET payload = :payload, hash = :old, certificate_id = :was WHERE seq = 2`,
			() => 'ledger entry 2',
			{ forged, hash, cid: first.id, payload: row.payload, old: row.hash, was: row.certificateId }
		);
		await sql('PRAGMA foreign_keys = OFF');
		await detects(
			'DELETE FROM ledger_entries WHERE seq = 2',
			`INSERT INTO ledger_entries (seq, event, certificate_id, payload, prev_hash, hash, key_id, signature, created_at) VALUES (2, :event, :certificateId, :payload, :prevHash, :hash, :keyId, :signature, :createdAt)`,
			() => 'ledger entry 2',
			{ ...row }
		);
		await sql('PRAGMA foreign_keys = ON');
	});

	it('finds hand edits of a certificate row: status, link, manifest, check, file hash', async () => {
		await detects(
			`UPDATE certificates SET status = 'withdrawn' WHERE id = :id`,
			`UPDATE certificates SET status = 'valid' WHERE id = :id`,
			() => `certificate ${second.id}`,
			{ id: second.id }
		);
		await detects(
			`UPDATE certificates SET superseded_by = NULL WHERE id = :id`,
			`UPDATE certificates SET superseded_by = :by WHERE id = :id`,
			() => `certificate ${first.id}`,
			{ id: first.id, by: second.id }
		);
		await detects(
			`UPDATE certificates SET manifest = replace(manifest, '"claimedSchmidtNumber":3', '"claimedSchmidtNumber":4') WHERE id = :id`,
			`UPDATE certificates SET manifest = replace(manifest, '"claimedSchmidtNumber":4', '"claimedSchmidtNumber":3') WHERE id = :id`,
			() => `certificate ${first.id}`,
			{ id: first.id }
		);
		await detects(
			`UPDATE certificates SET check_id = :other WHERE id = :id`,
			`UPDATE certificates SET check_id = :was WHERE id = :id`,
			() => `certificate ${second.id}`,
			{ id: second.id, other: otherCheck, was: second.checkId }
		);
		await detects(
			`UPDATE certificates SET pdf_sha256 = :zero WHERE id = :id`,
			`UPDATE certificates SET pdf_sha256 = :was WHERE id = :id`,
			() => `certificate ${second.id}`,
			{
				id: second.id,
				zero: '0'.repeat(64),
				was: (await world.database.models.Certificate.findByPk(second.id))!.get('pdfSha256')
			}
		);
	});

	it('names the first broken entry from the command line with exit status 1', async () => {
		await sql(`UPDATE ledger_entries SET signature = :sig WHERE seq = 3`, { sig: '0'.repeat(128) });
		try {
			const run = ledgerCli();
			expect(run.status).toBe(1);
			expect(run.out).toMatch(/^ledger BROKEN at ledger entry 3: its signature is not valid/);
		} finally {
			const entry = (await world.database.models.LedgerEntry.findByPk(3))!;
			const { signText } = await import('../../src/lib/evidence/signing');
			const { serviceKey } = await import('../../src/lib/server/evidence/keys');
			await sql(`UPDATE ledger_entries SET signature = :sig WHERE seq = 3`, {
				sig: signText(entry.get('payload') as string, serviceKey().secretKey)
			});
		}
		expect(ledgerCli().status).toBe(0);
	});
});

describe('orphan files', () => {
	it('sweeps certificate files no row owns (an issue interrupted after its rename) and keeps the rest', async () => {
		const folder = path.join(world.ctx.folder, 'certificates');
		mkdirSync(folder, { recursive: true });
		writeFileSync(path.join(folder, 'f00d.pdf'), 'left by a killed issue');
		writeFileSync(path.join(folder, `${first.id}.zip.abc123.part`), 'half written');
		// Both sides sorted: the certificate id is random, so its place among the names varies.
		expect((await sweepOrphanFiles(world.database)).sort()).toEqual(
			[`${first.id}.zip.abc123.part`, 'f00d.pdf'].sort()
		);
		expect(readdirSync(folder).sort()).toEqual(
			[first.id, second.id].sort().flatMap((id) => [`${id}.pdf`, `${id}.zip`])
		);
	});
});
