/**
 * Issue 15 part 5: a ledger cut short does not go unnoticed. The newest entries are deleted (a
 * withdrawal erased, the certificate row set back to valid) — which the chain check alone calls
 * intact — and `ledger:verify --checkpoint` (with a saved checkpoint, a bundle's, a notice
 * mail's), the remembered checkpoint, /seal with the bundle and a server start all name the
 * missing entry. A rewritten newest entry, re-signed with the service's own key, is named too.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { canonicalJson } from '../../src/lib/evidence/canonical';
import { parseCheckpoint, type LedgerCheckpoint } from '../../src/lib/evidence/checkpoint';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { signText } from '../../src/lib/evidence/signing';
import { serviceKey } from '../../src/lib/server/evidence/keys';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { withdrawCertificate } from '../../src/lib/server/certificates/certificate-withdraw';
import {
	issueCertificate,
	type CertificateView
} from '../../src/lib/server/certificates/certificates';
import { certificateFile, checkBundle } from '../../src/lib/server/certificates/certificate-reads';
import { publishCheckpoint } from '../../src/lib/server/ledger/ledger-checkpoint';
import { sendNotice } from '../../src/lib/server/mail/notices';
import { verifyLedger } from '../../src/lib/server/ledger/ledger-verify';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for bundling, issuing and Node child processes on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 900_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let scratch: string;
let first: CertificateView;
let second: CertificateView;
let bundle: Buffer;
let bundleFile: string;
let savedFile: string;
let mailFile: string;

const sql = (query: string, replacements: Record<string, unknown> = {}) =>
	world.database.sequelize.query(query, { replacements, type: QueryTypes.RAW });

/** `npm run --silent ledger:verify [-- --checkpoint FILE]` (the launcher and its bundle). */
function ledgerCli(...args: string[]) {
	const run = spawnSync(process.execPath, ['scripts/cli.mjs', 'ledger-verify', ...args], {
		encoding: 'utf8',
		env: { ...process.env }
	});
	return { status: run.status, out: run.stdout + run.stderr };
}

/** The checkpoint line of the newest notice mail (one line of JSON at the end of its text). */
async function newestMailCheckpoint(): Promise<LedgerCheckpoint> {
	const mails = await world.database.models.OutboxMail.findAll({ order: [['createdAt', 'ASC']] });
	const lines = mails.flatMap((m) => (m.get('text') as string).split('\n'));
	const checkpoints = lines.map((line) => parseCheckpoint(line)).filter((c) => c !== null);
	return checkpoints.sort((a, b) => a.entries - b.entries).at(-1)!;
}

beforeAll(async () => {
	world = await evidenceWorld();
	scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-checkpoints-'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(scratch, 'verify.mjs'));
	process.env.DATABASE_PATH = path.join(world.ctx.folder, 'rankseal.sqlite');
	const issue = async (seed: number) =>
		issueCertificate(
			world.database,
			world.author,
			world.claimId,
			(await finishedCheck(world, seed)).id
		);
	first = await issue(51);
	await withdrawCertificate(world.database, world.lead, first.id, 'The detector gate was mis-set.');
	second = await issue(52);
	bundle = (await certificateFile(world.database, world.author, second.id, 'bundle')).bytes;
	bundleFile = path.join(scratch, 'bundle.zip');
	writeFileSync(bundleFile, bundle);
	savedFile = path.join(scratch, 'saved.json');
	writeFileSync(savedFile, JSON.stringify(await publishCheckpoint(world.database)));
	mailFile = path.join(scratch, 'mail.json');
	writeFileSync(mailFile, JSON.stringify(await newestMailCheckpoint()));
});
afterAll(async () => {
	delete process.env.DATABASE_PATH;
	await world.ctx.close();
	rmSync(scratch, { recursive: true, force: true });
});

describe('checkpoints as issued', () => {
	it('are carried by the bundle (before its own issue entry) and the notice mail (after it)', async () => {
		const { report, ledger } = await checkBundle(world.database, bundle);
		expect(report).toMatchObject({ valid: true, checkpoint: { entries: 2 } });
		expect(ledger).toEqual({ extends: true, where: null, problem: null });
		expect(await newestMailCheckpoint()).toMatchObject({ entries: 3 });
	});

	it('end every sharing and review notice too, in its text and its HTML', async () => {
		const words = {
			sharer: 'Ada',
			email: 'ed@journal.test',
			manuscript: 'M-1',
			journal: 'J',
			claim: 'C'
		};
		const notice = {
			template: 'notice-claim-shared' as const,
			to: 'ed@journal.test',
			link: 'https://rankseal.test/x',
			words
		};
		const id = await sendNotice({ database: world.database }, notice);
		const mail = (await world.database.models.OutboxMail.findByPk(id))!.get({ plain: true });
		const line = mail.text.trimEnd().split('\n').at(-1)!;
		expect(parseCheckpoint(line)).toMatchObject({ entries: 3 });
		expect(mail.html).toContain(line.replaceAll('"', '&quot;'));
	});

	it('are extended by the ledger as it stands: ledger:verify --checkpoint exits 0', () => {
		for (const file of [savedFile, bundleFile, mailFile]) {
			const run = ledgerCli('--checkpoint', file);
			expect(run.status, run.out).toBe(0);
			expect(run.out).toMatch(/^ledger intact: 3 ledger entries, 2 certificates; it extends/);
		}
	});

	it('refuse a checkpoint file that is none, or one whose signature does not fit', () => {
		writeFileSync(path.join(scratch, 'junk.json'), '{"entries": 3}');
		expect(ledgerCli('--checkpoint', path.join(scratch, 'junk.json')).status).toBe(1);
		const forged = { ...parseCheckpoint(JSON.stringify(savedCheckpoint()))!, entries: 1 };
		writeFileSync(path.join(scratch, 'forged.json'), JSON.stringify(forged));
		const run = ledgerCli('--checkpoint', path.join(scratch, 'forged.json'));
		expect(run.status).toBe(1);
		expect(run.out).toMatch(/BROKEN at checkpoint: it is not signed by a key this service/);
	});
});

function savedCheckpoint(): LedgerCheckpoint {
	return parseCheckpoint(readFileSync(savedFile, 'utf8'))!;
}

describe('the newest entry rewritten and re-signed with the service key', () => {
	it('passes the chain check but not the checkpoint, which names the entry', async () => {
		const row = (await world.database.models.LedgerEntry.findByPk(3))!.get({ plain: true });
		const certificate = await world.database.models.Certificate.findByPk(second.id);
		const issuedBy = certificate!.get('issuedBy');
		const payload = canonicalJson({
			...JSON.parse(row.payload),
			details: { ...JSON.parse(row.payload).details, issuedBy: null }
		});
		const forged = {
			payload,
			hash: sha256Hex(payload),
			signature: signText(payload, serviceKey().secretKey)
		};
		await sql(
			'UPDATE ledger_entries SET payload = :payload, hash = :hash, signature = :signature WHERE seq = 3',
			forged
		);
		await sql('UPDATE certificates SET issued_by = NULL WHERE id = :id', { id: second.id });
		try {
			expect(await verifyLedger(world.database)).toMatchObject({ valid: true });
			const run = ledgerCli('--checkpoint', savedFile);
			expect(run.status).toBe(1);
			expect(run.out).toMatch(/^ledger BROKEN at ledger entry 3: changed/);
		} finally {
			await sql(
				'UPDATE ledger_entries SET payload = :payload, hash = :hash, signature = :signature WHERE seq = 3',
				{ ...row }
			);
			await sql('UPDATE certificates SET issued_by = :by WHERE id = :id', {
				id: second.id,
				by: issuedBy
			});
		}
		expect(ledgerCli('--checkpoint', savedFile).status).toBe(0);
	});
});

describe('the newest entries deleted: a withdrawal erased, the certificate valid again', () => {
	beforeAll(async () => {
		await sql('DELETE FROM ledger_entries WHERE seq >= 2');
		await sql('DELETE FROM certificates WHERE id = :id', { id: second.id });
		await sql(`UPDATE certificates SET status = 'valid' WHERE id = :id`, { id: first.id });
	});

	it('is what the chain check alone calls intact', async () => {
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true, entries: 1 });
	});

	it('fails ledger:verify --checkpoint (saved, bundle, mail) with exit 1, naming entry 2', () => {
		for (const file of [savedFile, bundleFile, mailFile]) {
			const run = ledgerCli('--checkpoint', file);
			expect(run.status, file).toBe(1);
			expect(run.out, file).toMatch(
				/^ledger BROKEN at ledger entry 2: missing: the ledger ends at entry 1/
			);
		}
	});

	it('fails plain ledger:verify too, against the checkpoint the service last published', () => {
		const run = ledgerCli();
		expect(run.status).toBe(1);
		expect(run.out).toMatch(
			/^ledger BROKEN at ledger entry 2: missing.*the last checkpoint this service published/
		);
	});

	it('is said by /seal for the bundle whose checkpoint the ledger no longer reaches', async () => {
		const { report, ledger } = await checkBundle(world.database, bundle);
		expect(report.valid).toBe(true);
		expect(ledger).toMatchObject({ extends: false, where: 'ledger entry 2' });
		expect(ledger!.problem).toMatch(/counted 2 \(entry 2 gone\)/);
	});

	it('is logged by a server started on the folder and shown on the admin pages', async () => {
		const logged = vi.spyOn(console, 'error').mockImplementation(() => undefined);
		process.env.MAIL_CATCHER_PORT = '0';
		const { app, stopApp } = await import('../../src/lib/server/app/app');
		try {
			await app();
			const warning = logged.mock.calls
				.map((c) => String(c[0]))
				.find((l) => l.startsWith('LEDGER WARNING'));
			expect(warning).toMatch(/ledger entry 2: missing: the ledger ends at entry 1/);
			const layout = await import('../../src/routes/(app)/admin/+layout.server');
			const admin = await world.database.models.User.findByPk(world.lead.userId);
			await admin!.update({ accountRole: 'admin' });
			const actor = {
				kind: 'user',
				userId: world.lead.userId,
				accountRole: 'admin',
				emailVerified: true
			};
			const data = await layout.load({ locals: { actor } } as never);
			expect(data).toMatchObject({ ledgerAlarm: expect.stringMatching(/ledger entry 2: missing/) });
			const author = { ...actor, userId: world.author.userId, accountRole: 'researcher' };
			expect(await layout.load({ locals: { actor: author } } as never)).toEqual({
				ledgerAlarm: null
			});
		} finally {
			logged.mockRestore();
			await stopApp();
		}
	});
});
