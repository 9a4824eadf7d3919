/**
 * Checks the whole ledger and every certificate row against it: the chain (sequence, previous
 * hashes, hashes, signatures) and, per certificate, the signed manifest and every column the
 * ledger or the manifest binds. Names the first broken entry or row.
 */
import { parseCanonical } from '../../evidence/canonical';
import { sha256Hex } from '../../evidence/hash';
import type { EvidenceManifest } from '../../evidence/manifest';
import { verifyText } from '../../evidence/signing';
import type { Database } from '../db';
import type { CertificateAttributes } from '../db/models/Certificate';
import type { LedgerEntryAttributes } from '../db/models/LedgerEntry';
import { publishedKeys } from '../evidence/keys';
import { GENESIS_HASH, LEDGER_FORMAT, type LedgerPayload } from './ledger';
import { issuerDigest } from './issuer-digest';
import { KeyChain } from './ledger-keys';

export interface LedgerReport {
	valid: boolean;
	entries: number;
	certificates: number;
	/** e.g. `ledger entry 7` or `certificate 4f1c…`. */
	firstBroken: string | null;
	problem: string | null;
}

class Broken extends Error {
	constructor(
		readonly where: string,
		message: string
	) {
		super(message);
	}
}

type Events = Map<string, LedgerPayload[]>;

function checkEntry(
	row: LedgerEntryAttributes,
	expectedSeq: number,
	prevHash: string,
	keys: Map<string, string>
): LedgerPayload {
	const where = `ledger entry ${expectedSeq}`;
	if (row.seq !== expectedSeq)
		throw new Broken(where, `found entry ${row.seq} instead: an entry is missing`);
	const p = parseCanonical(row.payload) as LedgerPayload | null;
	if (!p || p.format !== LEDGER_FORMAT)
		throw new Broken(where, 'its payload is not canonical ledger JSON');
	if (sha256Hex(row.payload) !== row.hash)
		throw new Broken(where, 'its hash does not match its payload');
	if (p.prevHash !== prevHash || row.prevHash !== prevHash)
		throw new Broken(where, 'it does not name the previous entry’s hash');
	const columns = [
		p.seq === row.seq,
		p.event === row.event,
		p.certificateId === row.certificateId,
		p.keyId === row.keyId
	];
	if (
		columns.includes(false) ||
		new Date(p.at).getTime() !== new Date(row.createdAt ?? 0).getTime()
	)
		throw new Broken(where, 'its columns differ from its signed payload');
	const publicKey = keys.get(row.keyId);
	if (!publicKey) throw new Broken(where, `signed with unknown key ${row.keyId}`);
	if (!verifyText(row.payload, row.signature, publicKey))
		throw new Broken(where, 'its signature is not valid');
	return p;
}

async function checkChain(
	database: Database,
	keys: Map<string, string>
): Promise<{ count: number; events: Events }> {
	const rows = await database.models.LedgerEntry.findAll({ order: [['seq', 'ASC']] });
	const events: Events = new Map();
	const chain = new KeyChain(keys);
	let prevHash = GENESIS_HASH;
	rows.forEach((r, i) => {
		const row = r.get({ plain: true });
		const payload = checkEntry(row, i + 1, prevHash, keys);
		const keyProblem = chain.entry(payload);
		if (keyProblem) throw new Broken(`ledger entry ${i + 1}`, keyProblem);
		prevHash = row.hash;
		const id = payload.certificateId;
		if (id !== null) events.set(id, [...(events.get(id) ?? []), payload]);
	});
	const early = chain.finish();
	if (early) throw new Broken(`ledger entry ${early.seq}`, early.problem);
	return { count: rows.length, events };
}

function expectedStatus(events: LedgerPayload[]) {
	const superseded = events.find((e) => e.event === 'supersede');
	const status = events.some((e) => e.event === 'withdraw')
		? 'withdrawn'
		: superseded
			? 'superseded'
			: 'valid';
	return { status, supersededBy: superseded?.details.supersededBy ?? null };
}

/**
 * The issuer as the entry binds it: an account id in entries before issuer digests, else the
 * salted digest recomputed from the row (issuer-digest.ts).
 */
function issuerBinding(c: CertificateAttributes, d: LedgerPayload['details']): [unknown, unknown] {
	if ('issuedBy' in d) return [c.issuedBy, d.issuedBy];
	const salt = d.issuerSalt;
	if (typeof salt !== 'string') return [c.issuedBy, undefined];
	return [issuerDigest(salt, c.issuedBy), d.issuerDigest];
}

function checkCertificate(
	c: CertificateAttributes,
	events: LedgerPayload[],
	keys: Map<string, string>
) {
	const fail = (problem: string) => new Broken(`certificate ${c.id}`, problem);
	const issue = events.find((e) => e.event === 'issue');
	if (!issue) throw fail('it has no issue entry in the ledger');
	const m = parseCanonical(c.manifest) as EvidenceManifest | null;
	if (!m) throw fail('its manifest is not canonical JSON');
	if (sha256Hex(c.manifest) !== c.fingerprint || issue.details.fingerprint !== c.fingerprint)
		throw fail('its manifest does not have the fingerprint the ledger recorded');
	const publicKey = keys.get(c.keyId);
	if (!publicKey || c.keyId !== m.signingKeyId || !verifyText(c.manifest, c.signature, publicKey))
		throw fail('its manifest signature is not valid');
	const d = issue.details;
	const bound: [unknown, unknown][] = [
		[c.id, m.certificateId],
		[c.claimId, m.claimId],
		[c.checkId, m.checkId],
		[c.supersedes, m.supersedes],
		[new Date(c.issuedAt).toISOString(), m.issuedAt],
		[c.pdfPath, d.pdfPath],
		[c.pdfSha256, d.pdfSha256],
		[c.bundlePath, d.bundlePath],
		[c.bundleSha256, d.bundleSha256],
		issuerBinding(c, d)
	];
	if (bound.some(([a, b]) => a !== b))
		throw fail('a column differs from its signed manifest or ledger entry');
	const expected = expectedStatus(events);
	if (c.status !== expected.status || c.supersededBy !== expected.supersededBy)
		throw fail(`its status says ${c.status}, the ledger says ${expected.status}`);
}

export async function verifyLedger(database: Database): Promise<LedgerReport> {
	const keys = new Map(publishedKeys().map((k) => [k.id, k.publicKey]));
	let entries = 0;
	let certificates = 0;
	try {
		const chain = await checkChain(database, keys);
		entries = chain.count;
		const rows = await database.models.Certificate.findAll({
			order: [
				['issuedAt', 'ASC'],
				['id', 'ASC']
			]
		});
		certificates = rows.length;
		for (const row of rows) {
			const c = row.get({ plain: true });
			checkCertificate(c, chain.events.get(c.id) ?? [], keys);
		}
		for (const id of chain.events.keys())
			if (!rows.some((r) => r.get('id') === id))
				throw new Broken(`certificate ${id}`, 'the ledger names it but its row is gone');
	} catch (error) {
		if (!(error instanceof Broken)) throw error;
		return {
			valid: false,
			entries,
			certificates,
			firstBroken: error.where,
			problem: error.message
		};
	}
	return { valid: true, entries, certificates, firstBroken: null, problem: null };
}
