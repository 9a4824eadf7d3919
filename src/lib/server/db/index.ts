/**
 * The one Sequelize instance: a SQLite file in WAL mode; every connection gets a busy timeout and
 * foreign keys (connections.ts); migrated by umzug at start-up. Write through writeTransaction.
 */
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { Sequelize, Transaction } from 'sequelize';
import sqlite3 from 'sqlite3';
import { SequelizeStorage, Umzug } from 'umzug';
import { config } from '../core/config';
import { configureEveryConnection, queueAutocommitWrites } from './connections';
import { migrations } from './migrations';
import { defineModels, type Models } from './models';

export { writeTransaction } from './transactions';

export interface Database {
	sequelize: Sequelize;
	models: Models;
}

export async function openDatabase(file: string): Promise<Database> {
	mkdirSync(path.dirname(file), { recursive: true });
	const sequelize = new Sequelize({
		dialect: 'sqlite',
		dialectModule: sqlite3,
		storage: file,
		logging: false,
		// Any transaction not made by writeTransaction still takes the write lock up front.
		transactionType: Transaction.TYPES.IMMEDIATE,
		// Statements outside transactions only; see queueAutocommitWrites.
		retry: { max: 5, match: [/SQLITE_BUSY/] }
	});
	configureEveryConnection(sequelize);
	queueAutocommitWrites(sequelize);
	const umzug = new Umzug({
		migrations: migrations.map((m) => ({ name: m.name, up: m.up, down: m.down })),
		context: sequelize.getQueryInterface(),
		storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
		logger: undefined
	});
	await umzug.up();
	return { sequelize, models: defineModels(sequelize) };
}

let shared: Promise<Database> | null = null;

/** The application's database, opened once per process at the configured path. */
export function db(): Promise<Database> {
	shared ??= openDatabase(config().databasePath);
	return shared;
}

/** Closes the shared database (tests, shutdown). */
export async function closeDb(): Promise<void> {
	if (!shared) return;
	const current = shared;
	shared = null;
	await (await current).sequelize.close();
}
