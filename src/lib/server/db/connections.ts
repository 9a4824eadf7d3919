/**
 * SQLite connections of one Sequelize instance. Sequelize's sqlite dialect bypasses its pool and
 * `afterConnect` hooks: it opens a fresh connection for every transaction (keyed by the
 * transaction's id) and one "default" connection for everything else. So the pragmas are applied
 * where connections are handed out, and writes of this process are queued one at a time (SQLite
 * has one writer anyway) so that no libuv thread sleeps in SQLite's busy handler waiting for a
 * writer of the same process.
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import type { Sequelize } from 'sequelize';

/** Per-connection settings; journal_mode is a property of the file, repeated for clarity. */
export const CONNECTION_PRAGMAS = [
	'PRAGMA busy_timeout = 5000',
	'PRAGMA journal_mode = WAL',
	'PRAGMA synchronous = NORMAL',
	'PRAGMA foreign_keys = ON'
];

interface SqliteConnection {
	exec(sql: string, callback: (error: Error | null) => void): void;
}

interface ConnectionManager {
	getConnection(options?: unknown): Promise<SqliteConnection>;
}

const applyPragmas = (connection: SqliteConnection) =>
	new Promise<void>((resolve, reject) =>
		connection.exec(CONNECTION_PRAGMAS.join(';\n') + ';', (error) =>
			error ? reject(error) : resolve()
		)
	);

/** Makes every connection Sequelize opens (default or per transaction) get CONNECTION_PRAGMAS. */
export function configureEveryConnection(sequelize: Sequelize): void {
	const manager = (sequelize as unknown as { connectionManager: ConnectionManager })
		.connectionManager;
	const open = manager.getConnection.bind(manager);
	// Concurrent callers may receive the same (default) connection: they share one set-up.
	const ready = new WeakMap<SqliteConnection, Promise<void>>();
	manager.getConnection = async (options) => {
		const connection = await open(options);
		let setUp = ready.get(connection);
		if (!setUp) {
			setUp = applyPragmas(connection);
			ready.set(connection, setUp);
		}
		await setUp;
		return connection;
	};
}

/** A FIFO lock that the holder's own async continuations pass through (no self-deadlock). */
export class WriteLock {
	private tail: Promise<void> = Promise.resolve();
	private readonly holder = new AsyncLocalStorage<boolean>();

	get heldHere(): boolean {
		return this.holder.getStore() === true;
	}

	async run<T>(work: () => Promise<T>): Promise<T> {
		if (this.heldHere) return work();
		let release!: () => void;
		const previous = this.tail;
		this.tail = new Promise<void>((resolve) => (release = resolve));
		await previous;
		try {
			return await this.holder.run(true, work);
		} finally {
			release();
		}
	}
}

const locks = new WeakMap<Sequelize, WriteLock>();

export function writeLock(sequelize: Sequelize): WriteLock {
	let lock = locks.get(sequelize);
	if (!lock) {
		lock = new WriteLock();
		locks.set(sequelize, lock);
	}
	return lock;
}

const READ_ONLY = /^\s*(SELECT|WITH|EXPLAIN)\b/i;

/**
 * Statements outside a transaction that may write (lucia's session rows, progress updates) wait
 * for the write lock; statements inside a transaction run on its connection unretried, since
 * only the whole transaction may be retried.
 */
export function queueAutocommitWrites(sequelize: Sequelize): void {
	const lock = writeLock(sequelize);
	const query = sequelize.query.bind(sequelize) as (...args: unknown[]) => Promise<unknown>;
	const wrapped = (sql: unknown, options?: { transaction?: unknown; retry?: unknown }) => {
		if (options?.transaction) return query(sql, { ...options, retry: { max: 1 } });
		const text = typeof sql === 'string' ? sql : ((sql as { query?: string })?.query ?? '');
		return READ_ONLY.test(text) ? query(sql, options) : lock.run(() => query(sql, options));
	};
	(sequelize as unknown as { query: typeof wrapped }).query = wrapped;
}
