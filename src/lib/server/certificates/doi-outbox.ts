/**
 * The DOI outbox: a certificate's DOI row is written in the transaction that issues it, and every
 * later change the registry must learn (superseded, withdrawn) raises its revision in the
 * transaction of that change. The sender (doi-sender.ts) tells the registry later, with retries:
 * issuing never waits on the registry, and an outage loses nothing.
 */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import type { DoiCreator } from '../db/models/CertificateDoi';
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

/** The certificate changed (superseded, withdrawn): its DOI metadata is sent again. */
export async function requeueDoi(
	database: Database,
	transaction: Transaction,
	certificateId: string
): Promise<void> {
	const row = await database.models.CertificateDoi.findByPk(certificateId, { transaction });
	if (!row) return; // issued before DOIs existed and not yet given one (queueMissingDois)
	const fresh = {
		status: 'queued' as const,
		attempts: 0,
		nextAttemptAt: new Date(),
		lastError: null
	};
	await row.update({ ...fresh, revision: (row.get('revision') as number) + 1 }, { transaction });
	transaction.afterCommit(notify);
}
