/** Sign in with ORCID: an account's ORCID iD (nullable; one account per iD). */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	// SQLite cannot add a UNIQUE column; a unique index does the same and lets many NULLs be.
	await q.addColumn('users', 'orcid', { type: DataTypes.STRING(19), allowNull: true });
	await q.addIndex('users', ['orcid'], { unique: true, name: 'users_orcid_unique' });
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeIndex('users', 'users_orcid_unique');
	await q.removeColumn('users', 'orcid');
}
