/**
 * The one Sequelize instance: a SQLite file in WAL mode with a busy timeout and foreign keys,
 * migrated by umzug at start-up.
 */
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { Sequelize } from 'sequelize';
import sqlite3 from 'sqlite3';
import { SequelizeStorage, Umzug } from 'umzug';
import { config } from '../config';
import { migrations } from './migrations';
import { defineModels, type Models } from './models';

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
		pool: { max: 1, min: 0 },
		retry: { max: 10, match: [/SQLITE_BUSY/] }
	});
	await sequelize.query('PRAGMA journal_mode = WAL;');
	await sequelize.query('PRAGMA busy_timeout = 5000;');
	await sequelize.query('PRAGMA foreign_keys = ON;');
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
