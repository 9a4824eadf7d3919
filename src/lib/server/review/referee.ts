/**
 * What a referee holding a review link sees and does: the claim, its current certificate, the
 * data with heat maps, re-runs of the certified check (recorded or fresh seed), the bundle.
 */
import { readFile } from 'node:fs/promises';
import type { CertificationResult } from '$lib/certify';
import { seedless } from '$lib/certify/seedless';
import { checkRequestJsonSchema, checkRequestSchema } from '$lib/claims/schema';
import { alignedRerun, firstDifference } from '$lib/evidence/compare';
import type { Actor, RefereeActor } from '../core/actor';
import { requireClaim } from '../access/permissions';
import type { Database } from '../db';
import { audit } from '../core/audit';
import { absolute } from '../storage/certificate-store';
import { certificateView, type CertificateView } from '../certificates/certificate-views';
import {
	cancelCheck,
	getCheck,
	mayCancelCheck,
	startCheck,
	type CheckView
} from '../checks/checks';
import {
	datasetTables,
	getDataset,
	type DatasetTables,
	type DatasetView
} from '../datasets/datasets';
import { NotFoundError } from '../core/errors';
import { ownReport, type ReportView } from './reports';
import { reviewedCertificates } from './review-certificate';
import { doiOf } from '../certificates/doi-view';
import type { Comparison, RefereeCheck } from '$lib/views/checks';

export type { Comparison, RefereeCheck } from '$lib/views/checks';

/** A referee chooses only the seed; everything else is the certified check's. */
export const refereeCheckSchema = checkRequestSchema.pick({ seed: true }).strict();
/** The API's body: the seed as a JSON number. */
export const refereeCheckJsonSchema = checkRequestJsonSchema.pick({ seed: true }).strict();
export type RefereeCheckInput = { seed?: number | string | null };

export interface RefereeView {
	claim: {
		id: string;
		title: string;
		sourceDescription: string;
		dimension: number;
		method: string;
		bases: number[];
		fourier: string;
		claimedSchmidtNumber: number;
	};
	/** The certificate under review: the one current when the link was made. */
	certificate: CertificateView;
	/** A certificate issued for the claim since then, if any. */
	newerCertificate: CertificateView | null;
	certified: CheckView;
	dataset: DatasetView;
	tables: DatasetTables['tables'];
	checks: RefereeCheck[];
	report: ReportView | null;
}

function asReferee(actor: Actor): RefereeActor {
	if (actor.kind !== 'referee') throw new NotFoundError('No such review link.');
	return actor;
}

/** The certificate this link was made for: re-runs, comparisons and the bundle are of it. */
const reviewedCertificate = async (database: Database, referee: RefereeActor) =>
	(await reviewedCertificates(database, referee)).reviewed;

/** Checks this link started (logged when started), oldest first. */
async function ownCheckIds(database: Database, actor: RefereeActor): Promise<string[]> {
	const rows = await database.models.AuditEvent.findAll({
		where: { action: 'review.check-started', subjectType: 'check' },
		order: [['createdAt', 'ASC']]
	});
	return rows
		.filter((r) => (r.get('details') as { reviewLinkId?: string }).reviewLinkId === actor.linkId)
		.map((r) => r.get('subjectId') as string);
}

/** The two engine versions when they differ: numbers of different engines differ by design. */
function enginesOf(a: CertificationResult, b: CertificationResult): Comparison['engines'] {
	const [certified, rerun] = [a.engine?.version ?? 'unknown', b.engine?.version ?? 'unknown'];
	return certified === rerun ? null : { certified, rerun };
}

export function compareRuns(certified: CheckView, rerun: CheckView): Comparison {
	const sameSeed = certified.seed === rerun.seed;
	const a = certified.result as CertificationResult;
	const b = rerun.result;
	if (!b)
		return { sameSeed, identical: null, withinError: null, firstDifference: null, engines: null };
	const difference = firstDifference(a, alignedRerun(a, b));
	const engines = enginesOf(a, b);
	// Trials and exact limits draw no random numbers (and have no standard error): bit or nothing.
	if (seedless(a))
		return {
			sameSeed,
			identical: !difference,
			withinError: !difference,
			firstDifference: difference,
			engines
		};
	const withinError = Math.abs(a.statistic.lower - b.statistic.lower) <= a.statistic.standardError;
	return {
		sameSeed,
		identical: difference === null,
		withinError,
		firstDifference: difference,
		engines
	};
}

/** Everything the review page shows. */
export async function refereeView(database: Database, actor: Actor): Promise<RefereeView> {
	const referee = asReferee(actor);
	const c = await requireClaim(database, referee, referee.claimId, 'read');
	const { reviewed: certificate, newer } = await reviewedCertificates(database, referee);
	const certified = await getCheck(database, referee, certificate.checkId);
	const dataset = await getDataset(database, referee, certified.datasetId);
	const { tables } = await datasetTables(database, referee, certified.datasetId);
	const checks = [];
	for (const id of await ownCheckIds(database, referee))
		checks.push(await refereeCheck(database, referee, id));
	const { id, title, sourceDescription, dimension, method, bases, fourier } = c;
	return {
		claim: {
			id,
			title,
			sourceDescription,
			dimension,
			method,
			bases,
			fourier,
			claimedSchmidtNumber: c.claimedSchmidtNumber
		},
		certificate: certificateView(certificate, await doiOf(database, certificate.id)),
		newerCertificate: newer ? certificateView(newer, await doiOf(database, newer.id)) : null,
		certified,
		dataset,
		tables,
		checks,
		report: await ownReport(database, referee)
	};
}

/** One re-run started through this link, with its comparison; 404 for any other check. */
export async function refereeCheck(
	database: Database,
	actor: Actor,
	checkId: string
): Promise<RefereeCheck> {
	const referee = asReferee(actor);
	if (!(await ownCheckIds(database, referee)).includes(checkId))
		throw new NotFoundError('No such check.');
	const certificate = await reviewedCertificate(database, referee);
	const certified = await getCheck(database, referee, certificate.checkId);
	const check = await getCheck(database, referee, checkId);
	return { ...check, comparison: compareRuns(certified, check) };
}

/** Re-runs the certified check with its dataset and settings, and the recorded or a fresh seed. */
export async function startRefereeCheck(
	database: Database,
	actor: Actor,
	input: RefereeCheckInput = {}
): Promise<RefereeCheck> {
	const referee = asReferee(actor);
	const { seed: freshSeed } = refereeCheckSchema.parse(input);
	const claim = await requireClaim(database, referee, referee.claimId, 'start-check');
	// startCheck holds the link to one re-run at a time (check-limits.ts): 429 over it.
	const certificate = await reviewedCertificate(database, referee);
	const certified = await getCheck(database, referee, certificate.checkId);
	const { resamples, confidence, datasetId } = certified;
	const settings = { datasetId, resamples, confidence, seed: freshSeed ?? certified.seed };
	const check = await startCheck(database, referee, referee.claimId, settings);
	const details = { reviewLinkId: referee.linkId, seed: check.seed };
	const entry = {
		actorId: null,
		groupId: claim.groupId,
		subjectType: 'check',
		subjectId: check.id
	};
	await audit(database, { ...entry, action: 'review.check-started', details });
	return { ...check, comparison: compareRuns(certified, check) };
}

/** Cancels one of this link's queued or running re-runs (cancel-check); 409 once it has ended. */
export async function cancelRefereeCheck(
	database: Database,
	actor: Actor,
	checkId: string
): Promise<RefereeCheck> {
	const referee = asReferee(actor);
	await cancelCheck(database, referee, checkId);
	return refereeCheck(database, referee, checkId);
}

/** The ids of the re-runs the referee may cancel now: the page offers a button for each. */
export async function cancellableReRuns(
	database: Database,
	actor: Actor,
	checks: CheckView[]
): Promise<string[]> {
	const going = checks.filter((c) => c.status === 'queued' || c.status === 'running');
	const allowed = await Promise.all(going.map((c) => mayCancelCheck(database, actor, c.id)));
	return going.filter((_, i) => allowed[i]).map((c) => c.id);
}

/** The current certificate's evidence bundle. */
export async function refereeBundle(database: Database, actor: Actor) {
	const referee = asReferee(actor);
	await requireClaim(database, referee, referee.claimId, 'read');
	const c = await reviewedCertificate(database, referee);
	const bytes = await readFile(absolute(c.bundlePath));
	return { bytes, filename: `rankseal-evidence-${c.id}.zip`, contentType: 'application/zip' };
}
