/**
 * The one way to write in a transaction: BEGIN IMMEDIATE (a deferred transaction that reads
 * first cannot take the write lock later in WAL mode), one writer of this process at a time, and
 * the whole transaction retried with bounded back-off when SQLite answers SQLITE_BUSY.
 */
import { Transaction, type Sequelize } from 'sequelize';
import { writeLock } from './connections';

/** Attempts in all, and the back-off before attempt n + 1 (capped); sums to a few seconds. */
export const MAX_ATTEMPTS = 8;
const BACKOFF_MS = (attempt: number) => Math.min(1000, 25 * 2 ** attempt) * (0.5 + Math.random());

export function isBusy(error: unknown): boolean {
	const e = error as { name?: string; message?: string; original?: { code?: string } } | null;
	const code = e?.original?.code ?? '';
	return (
		code === 'SQLITE_BUSY' ||
		code === 'SQLITE_LOCKED' ||
		/SQLITE_BUSY|SQLITE_LOCKED|database is locked/.test(e?.message ?? '')
	);
}

const pause = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * Runs `work` in an IMMEDIATE transaction, retrying it whole on SQLITE_BUSY. `work` may run more
 * than once: it must not have effects outside the database that a second run would repeat.
 */
export async function writeTransaction<T>(
	database: { sequelize: Sequelize },
	work: (transaction: Transaction) => Promise<T>
): Promise<T> {
	const { sequelize } = database;
	const lock = writeLock(sequelize);
	// A second connection would wait for this process's own write lock until busy_timeout.
	if (lock.heldHere) throw new Error('a write transaction cannot start inside another one');
	for (let attempt = 1; ; attempt++) {
		try {
			return await lock.run(() =>
				sequelize.transaction({ type: Transaction.TYPES.IMMEDIATE }, work)
			);
		} catch (error) {
			if (!isBusy(error) || attempt >= MAX_ATTEMPTS) throw error;
			await pause(BACKOFF_MS(attempt));
		}
	}
}
