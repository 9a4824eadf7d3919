/** Certificates (issued once, then only their status and successor link change) and the ledger. */
import { DataTypes, type QueryInterface } from 'sequelize';

const text = (allowNull = false) => ({ type: DataTypes.TEXT, allowNull });
const ref = (table: string, allowNull = false) => ({
	type: DataTypes.STRING,
	allowNull,
	references: { model: table, key: 'id' },
	onDelete: 'RESTRICT'
});

export async function up({ context: q }: { context: QueryInterface }) {
	await q.createTable('certificates', {
		id: { type: DataTypes.STRING, primaryKey: true, allowNull: false },
		claim_id: ref('claims'),
		check_id: ref('checks'),
		fingerprint: { type: DataTypes.STRING(64), allowNull: false, unique: true },
		manifest: text(),
		signature: { type: DataTypes.STRING(128), allowNull: false },
		key_id: { type: DataTypes.STRING(64), allowNull: false },
		status: { type: DataTypes.STRING, allowNull: false },
		supersedes: ref('certificates', true),
		superseded_by: ref('certificates', true),
		pdf_path: text(),
		pdf_sha256: { type: DataTypes.STRING(64), allowNull: false },
		bundle_path: text(),
		bundle_sha256: { type: DataTypes.STRING(64), allowNull: false },
		issued_by: { type: DataTypes.STRING, allowNull: true },
		issued_at: { type: DataTypes.DATE, allowNull: false },
		created_at: { type: DataTypes.DATE, allowNull: false },
		updated_at: { type: DataTypes.DATE, allowNull: false }
	});
	await q.addIndex('certificates', ['claim_id', 'issued_at']);
	await q.createTable('ledger_entries', {
		seq: { type: DataTypes.INTEGER, primaryKey: true, allowNull: false },
		event: { type: DataTypes.STRING, allowNull: false },
		certificate_id: ref('certificates'),
		payload: text(),
		prev_hash: { type: DataTypes.STRING(64), allowNull: false },
		hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
		key_id: { type: DataTypes.STRING(64), allowNull: false },
		signature: { type: DataTypes.STRING(128), allowNull: false },
		created_at: { type: DataTypes.DATE, allowNull: false }
	});
	await q.addIndex('ledger_entries', ['certificate_id']);
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.dropTable('ledger_entries');
	await q.dropTable('certificates');
}
