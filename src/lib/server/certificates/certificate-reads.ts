/**
 * Reading certificates: members of the claim's group see them and download their files; anyone
 * may look one up by id or fingerprint, or check a bundle, and learn only its status and what
 * the certificate itself shows.
 */
import { readFile } from 'node:fs/promises';
import { Op } from 'sequelize';
import type { VerificationReport } from '../../evidence/verify';
import type { Database } from '../db';
import type { CertificateAttributes } from '../db/models/Certificate';
import { publishedKeys } from '../evidence/keys';
import { engineTasks } from '../checks/registry';
import { absolute } from '../storage/certificate-store';
import { certificateView, publicCertificate, type CertificateView } from './certificate-views';
import { certificateAuthors } from '../certificates/certificate-authors';
import type { Actor } from '../core/actor';
import { decideClaim, requireClaim, type ClaimAction } from '../access/permissions';
import { NotFoundError } from '../core/errors';
import { takeOrRefuse } from '../core/rate-limits';
import type { CertificateAuthor, Lookup } from '$lib/views/certificates';
import { withdrawalOf } from '../ledger/ledger';
import { checkAgainst, type CheckpointCheck } from '../ledger/ledger-checkpoint';
import { doiOf, doisOf } from '../certificates/doi-view';

export type { Lookup } from '$lib/views/certificates';

/** The row when the caller may do `action` to its claim; a hidden claim hides the certificate. */
async function visibleCertificate(
	database: Database,
	caller: Actor,
	id: string,
	action: ClaimAction = 'read'
): Promise<CertificateAttributes> {
	const certificate = (await database.models.Certificate.findByPk(id))?.get({ plain: true });
	if (!certificate) throw new NotFoundError('No such certificate.');
	await requireClaim(database, caller, certificate.claimId, action).catch((error) => {
		throw error instanceof NotFoundError ? new NotFoundError('No such certificate.') : error;
	});
	return certificate;
}

export async function getCertificate(
	database: Database,
	caller: Actor,
	id: string
): Promise<CertificateView & { authors: CertificateAuthor[] }> {
	const row = await visibleCertificate(database, caller, id);
	return {
		...certificateView(row, await doiOf(database, id)),
		authors: await certificateAuthors(database, row.claimId)
	};
}

/** The claim's certificates, newest first. */
export async function listCertificates(
	database: Database,
	caller: Actor,
	claimId: string
): Promise<CertificateView[]> {
	await requireClaim(database, caller, claimId, 'read');
	const rows = await database.models.Certificate.findAll({
		where: { claimId },
		order: [['issuedAt', 'DESC']]
	});
	const dois = await doisOf(
		database,
		rows.map((r) => r.get('id') as string)
	);
	return rows.map((r) => certificateView(r.get({ plain: true }), dois.get(r.get('id') as string)));
}

/** Whether the caller may issue certificates for the claim (to offer the button or not). */
export async function mayIssueCertificate(
	database: Database,
	caller: Actor,
	claimId: string
): Promise<boolean> {
	const claim = await requireClaim(database, caller, claimId, 'read');
	if (claim.state === 'withdrawn') return false;
	return (await decideClaim(database, caller, claim, 'issue-certificate')) === 'allowed';
}

/** The PDF, or the evidence bundle (it holds the counts file, so it needs what datasets need). */
export async function certificateFile(
	database: Database,
	caller: Actor,
	id: string,
	kind: 'pdf' | 'bundle'
) {
	const c = await visibleCertificate(
		database,
		caller,
		id,
		kind === 'pdf' ? 'read' : 'read-datasets'
	);
	const bytes = await readFile(absolute(kind === 'pdf' ? c.pdfPath : c.bundlePath));
	return kind === 'pdf'
		? { bytes, filename: `rankseal-certificate-${id}.pdf`, contentType: 'application/pdf' }
		: { bytes, filename: `rankseal-evidence-${id}.zip`, contentType: 'application/zip' };
}

/** Public: a certificate by id or by fingerprint. */
export async function lookupCertificate(
	database: Database,
	idOrFingerprint: string
): Promise<Lookup> {
	const key = idOrFingerprint.trim().toLowerCase();
	if (!/^[0-9a-f-]{8,64}$/.test(key)) return { status: 'unknown' };
	const row = await database.models.Certificate.findOne({
		where: { [Op.or]: [{ id: key }, { fingerprint: key }] }
	});
	if (!row) return { status: 'unknown' };
	const certificate = row.get({ plain: true });
	const withdrawal =
		certificate.status === 'withdrawn' ? await withdrawalOf(database, certificate.id) : null;
	const authors = await certificateAuthors(database, certificate.claimId);
	return {
		...publicCertificate(certificate, await doiOf(database, certificate.id)),
		withdrawal,
		authors
	};
}

/** The public /seal pages ask no account, so their limits are per client address. */
const SEAL_WORDS = {
	sealBundle: 'Too many bundle checks from your network address.',
	sealLookup: 'Too many certificate look-ups from your network address.'
} as const;

/** Public, from the /seal pages: a look-up counted per client address (RATE_LIMITS.sealLookup). */
export async function lookupFrom(
	database: Database,
	idOrFingerprint: string,
	from: string
): Promise<Lookup> {
	await takeOrRefuse('sealLookup', from, SEAL_WORDS.sealLookup);
	return lookupCertificate(database, idOrFingerprint);
}

/**
 * Public: checks an uploaded bundle against the service's keys on the work pool (inflating and
 * re-running it would block every other request), then says what is on record. `from` is the
 * client address: bundles queue fairly by it, and each costs a worker thread, so it is counted
 * (RATE_LIMITS.sealBundle); callers that name no address (tests, scripts) are not counted.
 */
export async function checkBundle(
	database: Database,
	zip: Buffer,
	from?: string
): Promise<{ report: VerificationReport; record: Lookup; ledger: CheckpointCheck | null }> {
	if (from !== undefined) await takeOrRefuse('sealBundle', from, SEAL_WORDS.sealBundle);
	const trustedKeyIds = publishedKeys().map((k) => k.id);
	const tasks = await engineTasks(database);
	const report = await tasks.verifyBundle({ zip, trustedKeyIds }, `seal:${from ?? 'unknown'}`);
	const record = report.fingerprint
		? await lookupCertificate(database, report.fingerprint)
		: { status: 'unknown' as const };
	// A ledger cut short since the bundle was made may have lost this certificate's withdrawal.
	const ledger =
		report.valid && report.checkpoint ? await checkAgainst(database, report.checkpoint) : null;
	return { report, record, ledger };
}
