/** API tokens get an optional expiry; tokens issued before it keep none. */
import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: q }: { context: QueryInterface }) {
	await q.addColumn('api_tokens', 'expires_at', { type: DataTypes.DATE, allowNull: true });
}

export async function down({ context: q }: { context: QueryInterface }) {
	await q.removeColumn('api_tokens', 'expires_at');
}
