/** The first schema: accounts, groups, claims with their datasets and checks, tokens, audit, mail. */
import { DataTypes, type ModelAttributes, type QueryInterface } from 'sequelize';

const id = { type: DataTypes.STRING, primaryKey: true, allowNull: false };
const stamps = {
	created_at: { type: DataTypes.DATE, allowNull: false },
	updated_at: { type: DataTypes.DATE, allowNull: false }
};
const ref = (table: string, onDelete = 'CASCADE', allowNull = false) => ({
	type: DataTypes.STRING,
	allowNull,
	references: { model: table, key: 'id' },
	onDelete
});

/** The tables in the order they are made (each refers only to tables before it). */
const TABLES: [string, ModelAttributes][] = [
	[
		'users',
		{
			id,
			email: { type: DataTypes.STRING, allowNull: false, unique: true },
			name: { type: DataTypes.STRING, allowNull: false },
			password_hash: { type: DataTypes.STRING, allowNull: false },
			account_role: { type: DataTypes.STRING, allowNull: false, defaultValue: 'researcher' },
			email_verified_at: { type: DataTypes.DATE, allowNull: true },
			...stamps
		}
	],
	[
		'sessions',
		{
			id,
			user_id: ref('users'),
			expires_at: { type: DataTypes.DATE, allowNull: false }
		}
	],
	[
		'groups',
		{
			id,
			name: { type: DataTypes.STRING, allowNull: false },
			...stamps
		}
	],
	[
		'memberships',
		{
			id,
			group_id: ref('groups'),
			user_id: ref('users'),
			role: { type: DataTypes.STRING, allowNull: false },
			...stamps
		}
	],
	[
		'invitations',
		{
			id,
			group_id: ref('groups'),
			email: { type: DataTypes.STRING, allowNull: false },
			role: { type: DataTypes.STRING, allowNull: false },
			token_hash: { type: DataTypes.STRING, allowNull: false, unique: true },
			invited_by: ref('users'),
			expires_at: { type: DataTypes.DATE, allowNull: false },
			accepted_at: { type: DataTypes.DATE, allowNull: true },
			...stamps
		}
	],
	[
		'email_tokens',
		{
			id,
			user_id: ref('users'),
			purpose: { type: DataTypes.STRING, allowNull: false },
			token_hash: { type: DataTypes.STRING, allowNull: false, unique: true },
			expires_at: { type: DataTypes.DATE, allowNull: false },
			used_at: { type: DataTypes.DATE, allowNull: true },
			...stamps
		}
	],
	[
		'claims',
		{
			id,
			group_id: ref('groups', 'RESTRICT'),
			created_by: ref('users', 'RESTRICT'),
			title: { type: DataTypes.STRING, allowNull: false },
			source_description: { type: DataTypes.TEXT, allowNull: false },
			dimension: { type: DataTypes.INTEGER, allowNull: false },
			method: { type: DataTypes.STRING, allowNull: false },
			bases: { type: DataTypes.TEXT, allowNull: false },
			claimed_schmidt_number: { type: DataTypes.INTEGER, allowNull: false },
			manuscript_reference: { type: DataTypes.STRING, allowNull: true },
			state: { type: DataTypes.STRING, allowNull: false, defaultValue: 'draft' },
			...stamps
		}
	],
	[
		'datasets',
		{
			id,
			claim_id: ref('claims', 'RESTRICT'),
			created_by: ref('users', 'RESTRICT'),
			sha256: { type: DataTypes.STRING(64), allowNull: false },
			byte_size: { type: DataTypes.INTEGER, allowNull: false },
			format: { type: DataTypes.STRING, allowNull: false },
			original_name: { type: DataTypes.STRING, allowNull: false },
			summary: { type: DataTypes.JSON, allowNull: false },
			...stamps
		}
	],
	[
		'checks',
		{
			id,
			claim_id: ref('claims', 'RESTRICT'),
			dataset_id: ref('datasets', 'RESTRICT'),
			created_by: ref('users', 'SET NULL', true),
			status: { type: DataTypes.STRING, allowNull: false, defaultValue: 'queued' },
			progress: { type: DataTypes.FLOAT, allowNull: false, defaultValue: 0 },
			resamples: { type: DataTypes.INTEGER, allowNull: false },
			confidence: { type: DataTypes.FLOAT, allowNull: false },
			seed: { type: DataTypes.BIGINT, allowNull: false },
			result: { type: DataTypes.JSON, allowNull: true },
			error: { type: DataTypes.TEXT, allowNull: true },
			started_at: { type: DataTypes.DATE, allowNull: true },
			finished_at: { type: DataTypes.DATE, allowNull: true },
			...stamps
		}
	],
	[
		'api_tokens',
		{
			id,
			user_id: ref('users'),
			name: { type: DataTypes.STRING, allowNull: false },
			prefix: { type: DataTypes.STRING, allowNull: false },
			token_hash: { type: DataTypes.STRING, allowNull: false, unique: true },
			last_used_at: { type: DataTypes.DATE, allowNull: true },
			revoked_at: { type: DataTypes.DATE, allowNull: true },
			...stamps
		}
	],
	[
		'audit_events',
		{
			id,
			actor_id: { type: DataTypes.STRING, allowNull: true },
			group_id: { type: DataTypes.STRING, allowNull: true },
			action: { type: DataTypes.STRING, allowNull: false },
			subject_type: { type: DataTypes.STRING, allowNull: false },
			subject_id: { type: DataTypes.STRING, allowNull: true },
			details: { type: DataTypes.JSON, allowNull: false },
			created_at: { type: DataTypes.DATE, allowNull: false }
		}
	],
	[
		'mail_messages',
		{
			id,
			from: { type: DataTypes.STRING, allowNull: false },
			to: { type: DataTypes.TEXT, allowNull: false },
			subject: { type: DataTypes.STRING, allowNull: false },
			text: { type: DataTypes.TEXT, allowNull: false },
			html: { type: DataTypes.TEXT, allowNull: true },
			raw: { type: DataTypes.TEXT, allowNull: false },
			created_at: { type: DataTypes.DATE, allowNull: false }
		}
	]
];

/** Indexes made right after their table. */
const INDEXES: Record<string, { fields: string[]; unique?: boolean }> = {
	memberships: { fields: ['group_id', 'user_id'], unique: true },
	claims: { fields: ['group_id', 'created_at'] }
};

export async function up({ context: q }: { context: QueryInterface }) {
	for (const [name, columns] of TABLES) {
		await q.createTable(name, columns);
		const index = INDEXES[name];
		if (index) await q.addIndex(name, index.fields, index.unique ? { unique: true } : undefined);
	}
}

export async function down({ context: q }: { context: QueryInterface }) {
	for (const table of [
		'mail_messages',
		'audit_events',
		'api_tokens',
		'checks',
		'datasets',
		'claims',
		'email_tokens',
		'invitations',
		'memberships',
		'groups',
		'sessions',
		'users'
	]) {
		await q.dropTable(table);
	}
}
