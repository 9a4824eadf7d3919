/**
 * Ledger entries that introduce a signing key belong to no certificate: certificate_id may be
 * null. SQLite cannot relax NOT NULL in place, so the table is rebuilt with the same columns,
 * constraints and index, and every row copied as it is.
 */
import type { QueryInterface } from 'sequelize';

const table = (certificateId: 'NULL' | 'NOT NULL') =>
	'CREATE TABLE `ledger_entries_new` (`seq` INTEGER PRIMARY KEY, `event` VARCHAR(255) NOT NULL, ' +
	`\`certificate_id\` VARCHAR(255) ${certificateId} REFERENCES \`certificates\` (\`id\`) ON DELETE RESTRICT, ` +
	'`payload` TEXT NOT NULL, `prev_hash` VARCHAR(64) NOT NULL, `hash` VARCHAR(64) NOT NULL UNIQUE, ' +
	'`key_id` VARCHAR(64) NOT NULL, `signature` VARCHAR(128) NOT NULL, `created_at` DATETIME NOT NULL)';

async function rebuild(q: QueryInterface, certificateId: 'NULL' | 'NOT NULL') {
	const run = (sql: string) => q.sequelize.query(sql);
	await run(table(certificateId));
	await run('INSERT INTO `ledger_entries_new` SELECT * FROM `ledger_entries`');
	await run('DROP TABLE `ledger_entries`');
	await run('ALTER TABLE `ledger_entries_new` RENAME TO `ledger_entries`');
	await run('CREATE INDEX `ledger_entries_certificate_id` ON `ledger_entries` (`certificate_id`)');
}

export async function up({ context: q }: { context: QueryInterface }) {
	await rebuild(q, 'NULL');
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.sequelize.query("DELETE FROM `ledger_entries` WHERE `event` = 'key'");
	await rebuild(q, 'NOT NULL');
}
