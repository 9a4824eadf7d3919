/**
 * The DOI sender: tells the registry about every DOI row that is due, one at a time. A row is
 * claimed (queued/retrying → sending) by a conditional update, so one pass sends it once; a change
 * made meanwhile (a withdrawal) raises the revision and is sent by the next pass.
 */
import { dueRowsQuery } from '../core/outbox-due';
import type { Database } from '../db';
import type { CertificateDoiAttributes } from '../db/models/CertificateDoi';
import { retryDelayMs } from '../mail/mail-sender';
import { RegistryError, type DataciteClient } from './datacite-client';
import { dataciteAttributes } from './datacite-metadata';
import { doiSubject } from './doi-subject';

/** Attempts before a DOI registration is given up (the pages then say it has not succeeded). */
export const MAX_DOI_ATTEMPTS = 12;

export interface RegistrationReport {
	registered: string[];
	failed: string[];
}

async function claim(database: Database, row: CertificateDoiAttributes): Promise<boolean> {
	const [changed] = await database.models.CertificateDoi.update(
		{ status: 'sending', attempts: row.attempts + 1 },
		{ where: { certificateId: row.certificateId, status: row.status, revision: row.revision } }
	);
	return changed === 1;
}

const taken = (error: unknown) =>
	error instanceof RegistryError && error.status === 422 && /taken|exists/i.test(error.message);
const unknownThere = (error: unknown) => error instanceof RegistryError && error.status === 404;

/** Creates (Findable at once) or updates; a create the registry already has becomes an update. */
async function tell(database: Database, client: DataciteClient, row: CertificateDoiAttributes) {
	const certificate = await database.models.Certificate.findByPk(row.certificateId);
	if (!certificate) throw new RegistryError('the certificate is gone', null, true);
	const subject = (await doiSubject(database, certificate.get({ plain: true })))!;
	const create = () => client.create(dataciteAttributes(subject, true));
	const update = () => client.update(row.doi, dataciteAttributes(subject, false));
	if (!row.registeredAt) return create().catch((e) => (taken(e) ? update() : Promise.reject(e)));
	return update().catch((e) => (unknownThere(e) ? create() : Promise.reject(e)));
}

async function attempt(
	database: Database,
	client: DataciteClient,
	row: CertificateDoiAttributes,
	now: Date
): Promise<boolean> {
	const { CertificateDoi } = database.models;
	const attempts = row.attempts + 1;
	const same = { certificateId: row.certificateId, revision: row.revision };
	try {
		await tell(database, client, row);
	} catch (error) {
		const reason = (error instanceof Error ? error.message : String(error)).slice(0, 500);
		const givenUp =
			attempts >= MAX_DOI_ATTEMPTS || (error instanceof RegistryError && error.permanent);
		const nextAttemptAt = givenUp ? null : new Date(now.getTime() + retryDelayMs(attempts));
		const status = givenUp ? 'failed' : 'retrying';
		// A change queued meanwhile stays queued: it is sent afresh.
		await CertificateDoi.update({ status, nextAttemptAt, lastError: reason }, { where: same });
		return false;
	}
	const registeredAt = row.registeredAt ?? new Date();
	const accepted = { sentRevision: row.revision, registeredAt, lastError: null };
	const [done] = await CertificateDoi.update(
		{ ...accepted, status: 'done', nextAttemptAt: null },
		{ where: same }
	);
	if (done === 0)
		await CertificateDoi.update(accepted, { where: { certificateId: row.certificateId } });
	return true;
}

/**
 * Sends every DOI row due at `now` (queued, or retrying with its next try at or before `now`),
 * oldest first. Tests call this directly; the app calls it when woken and on a timer.
 */
export async function registerDue(
	database: Database,
	client: DataciteClient,
	now: Date = new Date(),
	keepGoing: () => boolean = () => true
): Promise<RegistrationReport> {
	const report: RegistrationReport = { registered: [], failed: [] };
	const due = await database.models.CertificateDoi.findAll(dueRowsQuery(now));
	for (const found of due) {
		if (!keepGoing()) break;
		const row = found.get({ plain: true });
		if (!(await claim(database, row))) continue;
		const ok = await attempt(database, client, row, now);
		(ok ? report.registered : report.failed).push(row.doi);
	}
	return report;
}

/**
 * At start: rows a stopped process left `sending` are due again now (create-or-update makes a
 * resend safe), and rows given up are tried afresh (the registry's settings may have been fixed).
 */
export async function resumeInterruptedDois(database: Database, now = new Date()): Promise<number> {
	const { CertificateDoi } = database.models;
	const [interrupted] = await CertificateDoi.update(
		{ status: 'retrying', nextAttemptAt: now, lastError: 'interrupted by a restart' },
		{ where: { status: 'sending' } }
	);
	const [givenUp] = await CertificateDoi.update(
		{ status: 'retrying', nextAttemptAt: now, attempts: 0 },
		{ where: { status: 'failed' } }
	);
	return interrupted + givenUp;
}
