/**
 * The DOI outbox: a certificate's DOI row is written in the transaction that issues it, and every
 * later change the registry must learn (superseded, withdrawn) raises its revision in the
 * transaction of that change. The sender (doi-sender.ts) tells the registry later, with retries:
 * issuing never waits on the registry, and an outage loses nothing.
 */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import type { DoiCreator, DoiStatus } from '../db/models/CertificateDoi';
import { RETRYABLE_DOI_STATES } from '$lib/doi-registration';
import { doiFor } from './doi-name';

type Listener = () => void;
const listeners = new Set<Listener>();

/** Called after a transaction that queued DOI work commits (the running app wakes its sender). */
export function onDoiQueued(listener: Listener): () => void {
	listeners.add(listener);
	return () => listeners.delete(listener);
}

const notify = () => listeners.forEach((listener) => listener());

/** The new certificate's DOI, queued for registration; returns the DOI. */
export async function queueDoi(
	database: Database,
	transaction: Transaction,
	certificateId: string,
	creators: DoiCreator[]
): Promise<string> {
	const doi = doiFor(certificateId);
	await database.models.CertificateDoi.create(
		{
			...{ certificateId, doi, creators: JSON.stringify(creators), status: 'queued' },
			...{ revision: 1, sentRevision: 0, attempts: 0, nextAttemptAt: new Date() },
			...{ lastError: null, registeredAt: null }
		},
		{ transaction }
	);
	transaction.afterCommit(notify);
	return doi;
}

/** A fresh start for the sender: due now, no attempts counted, no error kept. */
const freshAttempt = () => ({
	status: 'queued' as const,
	attempts: 0,
	nextAttemptAt: new Date(),
	lastError: null
});

/** The certificate changed (superseded, withdrawn): its DOI metadata is sent again. */
export async function requeueDoi(
	database: Database,
	transaction: Transaction,
	certificateId: string
): Promise<void> {
	const row = await database.models.CertificateDoi.findByPk(certificateId, { transaction });
	if (!row) return; // issued before DOIs existed and not yet given one (queueMissingDois)
	const revision = (row.get('revision') as number) + 1;
	await row.update({ ...freshAttempt(), revision }, { transaction });
	transaction.afterCommit(notify);
}

/**
 * A registration given up or waiting for its next try is sent again now, the same revision; any
 * other state is left alone. Returns the state the row had (null: no such row).
 */
export async function retryDoi(
	database: Database,
	transaction: Transaction,
	certificateId: string
): Promise<DoiStatus | null> {
	const { CertificateDoi } = database.models;
	const row = await CertificateDoi.findByPk(certificateId, { transaction });
	const status = (row?.get('status') as DoiStatus | undefined) ?? null;
	if (status === null || !RETRYABLE_DOI_STATES.includes(status)) return status;
	await row!.update(freshAttempt(), { transaction });
	transaction.afterCommit(notify);
	return status;
}
