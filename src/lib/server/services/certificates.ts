/**
 * Certificates: issued from a finished check in one transaction (row, files and ledger entries
 * together or not at all); a later issue for the same claim supersedes the earlier one.
 */
import { isTrialsResult } from '$lib/certify/trials';
import { isTargetResult } from '$lib/certify/fidelity-target';
import type { CertifiedResult } from '$lib/evidence/manifest';
import { targetPart } from '../checks/target-task';
import { readFile } from 'node:fs/promises';
import type { Transaction } from 'sequelize';
import { sha256Hex } from '../../evidence/hash';
import { startCheckRunner } from '../checks/registry';
import { config } from '../config';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { ClaimAttributes } from '../db/models/Claim';
import { makeEvidence, type Evidence, type EvidenceInput } from '../evidence/artifacts';
import { publishedKeys, serviceKey } from '../evidence/keys';
import type { SigningKey } from '../../evidence/signing';
import { accountIdOf, type Actor } from '../access/actor';
import { requireClaim, requireOpen } from '../access/permissions';
import { audit } from './audit';
import { certificatePaths, placeFiles, removeFiles } from './certificate-files';
import { statedResult, type StatedResult } from './certificate-analyses';
import { certificateContext } from './certificate-context';
import { certificateRow, issueDetails } from './certificate-rows';
import { certificateView, evidenceUrls, type CertificateView } from './certificate-views';
import { queueCertificateNotice } from './claim-notices';
import { datasetFilePath } from './datasets';
import { ConflictError, NotFoundError } from './errors';
import { newId } from './ids';
import { queueReviewNotices } from './review-notices';
import { appendLedger } from './ledger';
import { publishCheckpoint } from './ledger-checkpoint';

export type { CertificateView } from './certificate-views';

/** Thrown when another certificate was issued for the claim while this one was being made. */
export class IssueConflictError extends ConflictError {
	constructor(message: string) {
		super(message);
		this.name = 'IssueConflictError';
	}
}

async function finishedCheck(database: Database, claimId: string, checkId: string) {
	const row = await database.models.Check.findOne({ where: { id: checkId, claimId } });
	if (!row) throw new NotFoundError('No such check on this claim.');
	const check = row.get({ plain: true });
	if (check.reviewLinkId)
		throw new ConflictError(
			"This check is a referee's re-run from a review link: it is the referee's, and only the group's own checks can be certified."
		);
	if (check.status !== 'done' || !check.result)
		throw new ConflictError('Only a finished check can be certified.');
	// Certificates from time-ordered trials (issue 20, slice 2) are not built yet: refuse plainly.
	if (isTrialsResult(check.result))
		throw new ConflictError(
			'A check on time-ordered trials cannot be certified yet; its result page and JSON stand on their own.'
		);
	const dataset = (await database.models.Dataset.findByPk(check.datasetId))!.get({ plain: true });
	const uploaded = await readFile(datasetFilePath(dataset.sha256));
	if (sha256Hex(uploaded) !== dataset.sha256)
		throw new Error(`stored counts file ${dataset.sha256} no longer matches its SHA-256`);
	return { check, dataset, uploaded };
}

async function currentCertificate(database: Database, claimId: string, transaction?: Transaction) {
	const row = await database.models.Certificate.findOne({
		where: { claimId, status: 'valid' },
		order: [['issuedAt', 'DESC']],
		transaction
	});
	return (row?.get('id') as string | undefined) ?? null;
}

type CheckSource = Awaited<ReturnType<typeof finishedCheck>>;

/** fidelity-target: the target the check ran with, as the claim declared it (the verifier re-runs it). */
function targetRecord(claim: ClaimAttributes, result: CertifiedResult) {
	const target = targetPart(claim);
	if (!isTargetResult(result)) return {};
	if (!target) throw new ConflictError('This fidelity-target claim has no declared target λ.');
	return { target: { ...target, source: 'declared' as const } };
}

/** What the manifest records: the claim as it stands, the check's settings and its result. */
function evidenceInput(
	claim: ClaimAttributes,
	{ check, dataset, uploaded }: CheckSource,
	{ result, confidence, analyses }: StatedResult,
	certificateId: string,
	supersedes: string | null
): EvidenceInput {
	return {
		certificateId,
		issuedAt: new Date().toISOString(),
		claimId: claim.id,
		checkId: check.id,
		supersedes,
		// What the check ran with (a claim edited since then must not change the record).
		claim: {
			title: claim.title,
			dimension: result.dimension,
			method: result.method,
			bases: result.bases,
			fourier: 'fourier' in result ? result.fourier : null,
			claimedSchmidtNumber: result.claim?.schmidtNumber ?? claim.claimedSchmidtNumber,
			manuscriptReference: claim.manuscriptReference ?? null
		},
		parameters: {
			resamples: check.resamples,
			confidence,
			seed: Number(check.seed),
			subtractAccidentals: 'backgroundSubtracted' in result && result.backgroundSubtracted
		},
		...targetRecord(claim, result),
		result,
		analyses,
		uploaded,
		uploadedFormat: dataset.format,
		calibrationBytes: dataset.calibration ? new Uint8Array(dataset.calibration) : null
	};
}

async function prepare(
	database: Database,
	caller: Actor,
	claimId: string,
	checkId: string,
	key: SigningKey
) {
	const claim = await requireClaim(database, caller, claimId, 'issue-certificate');
	const source = await finishedCheck(database, claimId, checkId);
	const id = newId();
	const supersedes = await currentCertificate(database, claimId);
	const stated = await statedResult(database, claim, source);
	const context = await certificateContext(database, claim, source.dataset);
	const input = { ...evidenceInput(claim, source, stated, id, supersedes), context };
	const urls = evidenceUrls(config().origin, id);
	// The ledger as it stands before this issue: the bundle cannot hold a hash of its own entry.
	const checkpoint = await publishCheckpoint(database, key);
	const evidence = await makeEvidence(input, key, urls, { keys: publishedKeys() }, checkpoint);
	const runner = await startCheckRunner(database);
	const verdict = await runner.selfCheck(
		evidence.files,
		`issue:${accountIdOf(caller) ?? 'service'}`
	);
	if (!verdict.valid)
		throw new ConflictError(
			`This check cannot be certified (${verdict.failedItem}: ${verdict.message}); run the check again`
		);
	return { claim, evidence, supersedes };
}

async function store(
	database: Database,
	userId: string,
	evidence: Evidence,
	groupId: string,
	key: SigningKey,
	transaction: Transaction
) {
	const row = certificateRow(evidence, key.id, userId);
	const { id, supersedes, fingerprint } = row;
	await database.models.Certificate.create(row, { transaction });
	const details = issueDetails(row);
	await appendLedger(database, { event: 'issue', certificateId: id, details }, key, transaction);
	if (supersedes) {
		await database.models.Certificate.update(
			{ status: 'superseded', supersededBy: id },
			{ where: { id: supersedes }, transaction }
		);
		const event = { event: 'supersede' as const, certificateId: supersedes };
		await appendLedger(database, { ...event, details: { supersededBy: id } }, key, transaction);
	}
	const claim = await database.models.Claim.findByPk(row.claimId, { transaction });
	// Read inside the transaction: a withdrawal that landed meanwhile is never undone by an issue.
	requireOpen(claim!.get({ plain: true }), 'issue-certificate');
	await claim!.update({ state: 'certified' }, { transaction });
	const entry = { actorId: userId, groupId, subjectType: 'certificate', subjectId: id };
	const action = 'certificate.issued';
	await audit(database, { ...entry, action, details: { fingerprint, supersedes } }, transaction);
	await queueCertificateNotice(database, row, transaction);
	await queueReviewNotices(database, row.claimId, id, transaction);
	return row;
}

/**
 * Issues a certificate for a finished check of the claim. NotFoundError when the claim or check
 * is out of sight; ForbiddenError for callers who may not issue; ConflictError when the check cannot
 * be certified (unfinished, or its result no longer re-runs); IssueConflictError when another issue won the race; on any failure nothing stays.
 */
export async function issueCertificate(
	database: Database,
	caller: Actor,
	claimId: string,
	checkId: string
): Promise<CertificateView> {
	const key = serviceKey();
	const { claim, evidence, supersedes } = await prepare(database, caller, claimId, checkId, key);
	// Members only (permissions.ts), so the caller has an account.
	const userId = accountIdOf(caller)!;
	const paths = certificatePaths(evidence.manifest.certificateId);
	let placed: string[] = [];
	try {
		const row = await writeTransaction(database, async (transaction) => {
			if ((await currentCertificate(database, claimId, transaction)) !== supersedes)
				throw new IssueConflictError(
					'Another certificate was issued for this claim meanwhile; try again.'
				);
			const stored = await store(database, userId, evidence, claim.groupId, key, transaction);
			placed = await placeFiles([
				[paths.pdfPath, evidence.pdf],
				[paths.bundlePath, evidence.zip]
			]);
			return stored;
		});
		await publishCheckpoint(database);
		return certificateView(row);
	} catch (error) {
		await removeFiles(placed);
		throw error;
	}
}
