/**
 * The DOI outbox for admins: every certificate's registration at the registry, how it stands, and
 * "try again now" for one that was given up or waits for its next try.
 */
import { RETRYABLE_DOI_STATES } from '$lib/doi-registration';
import { MAX_PAGE } from '$lib/paging';
import type { Actor } from '../core/actor';
import { ConflictError, NotFoundError } from '../core/errors';
import { requireService } from '../access/permissions';
import type { Database } from '../db';
import type { CertificateDoiAttributes, DoiStatus } from '../db/models/CertificateDoi';
import { writeTransaction } from '../db/transactions';
import { doiLink } from './doi-name';
import { retryDoi } from './doi-outbox';

export interface DoiRegistrationItem {
	certificateId: string;
	doi: string;
	/** Where the DOI resolves (the local fake registry's resolver when DATACITE_URL is unset). */
	url: string;
	claimTitle: string;
	status: DoiStatus;
	/** Changes the registry must learn (issue, supersede, withdraw) against those it accepted. */
	revision: number;
	sentRevision: number;
	attempts: number;
	nextAttemptAt: string | null;
	lastError: string | null;
	registeredAt: string | null;
	createdAt: string;
}

export interface DoiRegistrationPage {
	items: DoiRegistrationItem[];
	total: number;
	page: number;
	pageSize: number;
}

export const DOI_OUTBOX_PAGE_SIZE = 50;

const iso = (date: Date | null | undefined) => (date ? new Date(date).toISOString() : null);

/** The claim title of each certificate, by certificate id. */
async function claimTitles(database: Database, certificateIds: string[]) {
	const { Certificate, Claim } = database.models;
	if (!certificateIds.length) return new Map<string, string>();
	const certificates = await Certificate.findAll({
		attributes: ['id', 'claimId'],
		where: { id: certificateIds }
	});
	const claimIds = [...new Set(certificates.map((c) => c.get('claimId') as string))];
	const claims = await Claim.findAll({ attributes: ['id', 'title'], where: { id: claimIds } });
	const titles = new Map(claims.map((c) => [c.get('id') as string, c.get('title') as string]));
	return new Map(
		certificates.map((c) => [c.get('id') as string, titles.get(c.get('claimId') as string) ?? ''])
	);
}

function item(row: CertificateDoiAttributes, claimTitle: string): DoiRegistrationItem {
	return {
		...{ certificateId: row.certificateId, doi: row.doi, url: doiLink(row.doi), claimTitle },
		...{ status: row.status, revision: row.revision, sentRevision: row.sentRevision },
		...{ attempts: row.attempts, nextAttemptAt: iso(row.nextAttemptAt), lastError: row.lastError },
		...{ registeredAt: iso(row.registeredAt), createdAt: iso(row.createdAt)! }
	};
}

/** Registrations newest first, `status` alone when given. Admins only. */
export async function listDoiRegistrations(
	database: Database,
	actor: Actor,
	page = 1,
	status: DoiStatus | null = null
): Promise<DoiRegistrationPage> {
	await requireService(database, actor, 'read-doi-outbox');
	const current = Math.min(MAX_PAGE, Math.max(1, Math.floor(page) || 1));
	const { rows, count } = await database.models.CertificateDoi.findAndCountAll({
		attributes: { exclude: ['creators'] },
		where: status ? { status } : {},
		order: [
			['createdAt', 'DESC'],
			['certificateId', 'DESC']
		],
		limit: DOI_OUTBOX_PAGE_SIZE,
		offset: (current - 1) * DOI_OUTBOX_PAGE_SIZE
	});
	const plain = rows.map((row) => row.get({ plain: true }));
	const titles = await claimTitles(
		database,
		plain.map((row) => row.certificateId)
	);
	const items = plain.map((row) => item(row, titles.get(row.certificateId) ?? ''));
	return { items, total: count, page: current, pageSize: DOI_OUTBOX_PAGE_SIZE };
}

const NOT_NOW: Partial<Record<DoiStatus, string>> = {
	done: 'The registry already holds this DOI’s current record; there is nothing to send again.',
	queued: 'This registration is already waiting to be sent.',
	sending: 'This registration is being sent right now.'
};

/**
 * Sends a given-up or waiting registration at once: queued, attempts from 0, no error kept, the
 * same revision; the sender is woken once the change is committed. Admins only.
 */
export async function retryDoiNow(
	database: Database,
	actor: Actor,
	certificateId: string
): Promise<void> {
	await requireService(database, actor, 'retry-doi');
	const was = await writeTransaction(database, (t) => retryDoi(database, t, certificateId));
	if (was === null) throw new NotFoundError('No certificate has this DOI registration.');
	if (!RETRYABLE_DOI_STATES.includes(was)) throw new ConflictError(NOT_NOW[was]!);
}
