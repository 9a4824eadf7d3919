/**
 * Certificates: issued from a finished check in one transaction (row, files and ledger entries
 * together or not at all); a later issue for the same claim supersedes the earlier one.
 */
import { ENGINE_VERSION } from '$lib/certify';
import { isTrialsResult } from '$lib/certify/trials';
import { isTargetResult } from '$lib/certify/fidelity-target';
import type { CertifiedResult } from '$lib/evidence/manifest';
import { targetPart } from '../checks/target-task';
import { countsFormatOf, targetRunName } from '$lib/evidence/layout';
import { readFile } from 'node:fs/promises';
import type { Transaction } from 'sequelize';
import { sha256Hex } from '../../evidence/hash';
import { engineTasks } from '../checks/registry';
import { config } from '../core/config';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import type { ClaimAttributes } from '../db/models/Claim';
import { makeEvidence, type Evidence, type EvidenceInput } from '../evidence/artifacts';
import { publishedKeys, serviceKey } from '../evidence/keys';
import type { SigningKey } from '../../evidence/signing';
import { accountIdOf, type Actor } from '../core/actor';
import { requireClaim, requireOpen } from '../access/permissions';
import { audit } from '../core/audit';
import { placeFiles, removeFiles } from '../storage/certificate-store';
import { statedResult, type StatedResult } from './certificate-analyses';
import { certificateContext } from './certificate-context';
import { certificateRow, issueDetails } from './certificate-rows';
import { certificateView, evidenceUrls, type CertificateView } from './certificate-views';
import { queueCertificateNotice } from '../mail/claim-notices';
import { datasetFilePath } from '../storage/counts-store';
import { ConflictError, NotFoundError } from '../core/errors';
import { newId } from '../core/ids';
import { queueReviewNotices } from '../mail/review-notices';
import { appendLedger } from '../ledger/ledger';
import { ledgerRole } from '../ledger/ledger-roles';
import { publishCheckpoint } from '../ledger/ledger-checkpoint';
import { authorsOf } from '../certificates/doi-creators';
import { doiFor } from '../certificates/doi-name';
import { doiOf } from '../certificates/doi-view';
import { queueDoi, requeueDoi } from '../certificates/doi-outbox';
import type { DoiCreator } from '../db/models/CertificateDoi';
import { trialsEvidenceInput } from '../certificates/trials-input';

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

/**
 * fidelity-target: the target the check ran with, declared or fitted on a calibration run (then
 * the run's file, hash and fit, and its bytes for the bundle); the verifier re-runs it.
 */
function targetRecord(claim: ClaimAttributes, result: CertifiedResult) {
	const target = targetPart(claim);
	if (!isTargetResult(result)) return {};
	if (!target) throw new ConflictError('This fidelity-target claim has no target λ.');
	const { run, ...declared } = target;
	if (!run || !claim.targetFit) return { target: { ...declared, source: 'declared' as const } };
	const file = targetRunName(countsFormatOf(run.bytes));
	return {
		target: {
			...declared,
			source: 'calibration-run' as const,
			run: { file, sha256: run.sha256, bytes: run.bytes.byteLength },
			fit: claim.targetFit
		},
		targetRunBytes: run.bytes
	};
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

/** A bundle must re-run under its own verify.mjs, which has this service's engine. */
function requireThisEngine(version: string | undefined) {
	if (version !== ENGINE_VERSION)
		throw new ConflictError(
			`This check was run by engine ${version ?? 'unknown'}, and this service has engine ${ENGINE_VERSION}; run the check again to certify it`
		);
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
	requireThisEngine((source.check.result as { engine?: { version?: string } }).engine?.version);
	const id = newId();
	const supersedes = await currentCertificate(database, claimId);
	const tasks = await engineTasks(database);
	const context = await certificateContext(database, claim, source.dataset);
	// Time-ordered trials (issue 20): their own result, file and stated assumption.
	const recorded = isTrialsResult(source.check.result)
		? await trialsEvidenceInput(database, tasks, claim, source, { certificateId: id, supersedes })
		: evidenceInput(claim, source, await statedResult(database, claim, source), id, supersedes);
	const input = { ...recorded, context };
	// The DOI is known before the registry hears of it: the PDF prints it (doi-name.ts).
	const urls = { ...evidenceUrls(config().origin, id), doi: doiFor(id) };
	const creators = await authorsOf(database, claim);
	// The ledger as it stands before this issue: the bundle cannot hold a hash of its own entry.
	const checkpoint = await publishCheckpoint(database, key);
	const evidence = await makeEvidence(input, key, urls, { keys: publishedKeys() }, checkpoint);
	const verdict = await tasks.selfCheck(
		evidence.files,
		`issue:${accountIdOf(caller) ?? 'service'}`
	);
	if (!verdict.valid)
		throw new ConflictError(
			`This check cannot be certified (${verdict.failedItem}: ${verdict.message}); run the check again`
		);
	requireThisEngine(verdict.otherEngine ?? ENGINE_VERSION);
	return { claim, evidence, supersedes, creators };
}

async function store(
	database: Database,
	userId: string,
	evidence: Evidence,
	groupId: string,
	key: SigningKey,
	creators: DoiCreator[],
	transaction: Transaction
) {
	const row = certificateRow(evidence, key.id, userId);
	const { id, supersedes, fingerprint } = row;
	await database.models.Certificate.create(row, { transaction });
	const details = issueDetails(row, await ledgerRole(database, userId, groupId, transaction));
	await appendLedger(database, { event: 'issue', certificateId: id, details }, key, transaction);
	await queueDoi(database, transaction, id, creators);
	if (supersedes) {
		await database.models.Certificate.update(
			{ status: 'superseded', supersededBy: id },
			{ where: { id: supersedes }, transaction }
		);
		const event = { event: 'supersede' as const, certificateId: supersedes };
		await appendLedger(database, { ...event, details: { supersededBy: id } }, key, transaction);
		await requeueDoi(database, transaction, supersedes);
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
	const prepared = await prepare(database, caller, claimId, checkId, key);
	const { claim, evidence, supersedes, creators } = prepared;
	// Members only (permissions.ts), so the caller has an account.
	const userId = accountIdOf(caller)!;
	let placed: string[] = [];
	try {
		const row = await writeTransaction(database, async (transaction) => {
			if ((await currentCertificate(database, claimId, transaction)) !== supersedes)
				throw new IssueConflictError(
					'Another certificate was issued for this claim meanwhile; try again.'
				);
			// Placed where the row says (certificate-rows.ts computes the paths, once).
			const group = claim.groupId;
			const stored = await store(database, userId, evidence, group, key, creators, transaction);
			placed = await placeFiles([
				[stored.pdfPath, evidence.pdf],
				[stored.bundlePath, evidence.zip]
			]);
			return stored;
		});
		await publishCheckpoint(database);
		return certificateView(row, await doiOf(database, row.id));
	} catch (error) {
		await removeFiles(placed);
		throw error;
	}
}
