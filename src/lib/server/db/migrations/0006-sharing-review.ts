/** Shares of a claim with an editor, the editor's review links, and the referees' reports. */
import { DataTypes, type QueryInterface } from 'sequelize';

const text = (allowNull = false) => ({ type: DataTypes.TEXT, allowNull });
const date = (allowNull = false) => ({ type: DataTypes.DATE, allowNull });
const ref = (table: string, allowNull = false) => ({
	type: DataTypes.STRING,
	allowNull,
	references: { model: table, key: 'id' },
	onDelete: 'RESTRICT'
});
const timestamps = { created_at: date(), updated_at: date() };

export async function up({ context: q }: { context: QueryInterface }) {
	await q.createTable('shares', {
		id: { type: DataTypes.STRING, primaryKey: true, allowNull: false },
		claim_id: ref('claims'),
		editor_email: { type: DataTypes.STRING, allowNull: false },
		editor_id: ref('users', true),
		journal: text(),
		manuscript: text(),
		// The notice's link (SHA-256 only) lets an editor without an account make one.
		token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
		shared_by: ref('users'),
		withdrawn_at: date(true),
		...timestamps
	});
	await q.addIndex('shares', ['claim_id']);
	await q.addIndex('shares', ['editor_email']);
	await q.createTable('review_links', {
		id: { type: DataTypes.STRING, primaryKey: true, allowNull: false },
		share_id: ref('shares'),
		claim_id: ref('claims'),
		token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
		label: text(true),
		expires_at: date(),
		revoked_at: date(true),
		created_by: ref('users'),
		...timestamps
	});
	await q.addIndex('review_links', ['share_id']);
	await q.createTable('reports', {
		id: { type: DataTypes.STRING, primaryKey: true, allowNull: false },
		review_link_id: { ...ref('review_links'), unique: true },
		claim_id: ref('claims'),
		recommendation: { type: DataTypes.STRING, allowNull: false },
		comments: text(),
		submitted_at: date(true),
		released_at: date(true),
		...timestamps
	});
	await q.addIndex('reports', ['claim_id']);
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.dropTable('reports');
	await q.dropTable('review_links');
	await q.dropTable('shares');
}
