/**
 * Issue 15: the SHA-256 of a counts file's canonical form (the same counts in several claims are
 * one file), and the certificate a review link was made for (the referee's page names it).
 */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('datasets', 'counts_sha256', { type: DataTypes.STRING(64), allowNull: true });
	await q.addIndex('datasets', ['counts_sha256']);
	await q.addColumn('review_links', 'certificate_id', { type: DataTypes.STRING, allowNull: true });
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeColumn('review_links', 'certificate_id');
	await q.removeIndex('datasets', ['counts_sha256']);
	await q.removeColumn('datasets', 'counts_sha256');
}
