/**
 * When the editor opened a share's link: "opened" was read from the bound account, which an
 * editor who already had one got at once. Earlier openings are taken from the audit trail.
 */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('shares', 'opened_at', { type: DataTypes.DATE, allowNull: true });
	await q.sequelize.query(
		`UPDATE shares SET opened_at = (SELECT MIN(created_at) FROM audit_events
		 WHERE action = 'share.opened' AND subject_id = shares.id)`
	);
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeColumn('shares', 'opened_at');
}
