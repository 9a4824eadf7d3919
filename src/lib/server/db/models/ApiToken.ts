import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

/** A bearer token for scripts: shown once, stored as SHA-256, revocable, optionally expiring. Acts as its user. */
export interface ApiTokenAttributes {
	id: string;
	userId: string;
	name: string;
	/** First characters of the token, to tell tokens apart in lists. */
	prefix: string;
	tokenHash: string;
	lastUsedAt: Date | null;
	revokedAt: Date | null;
	/** After this moment the token is refused; null: it never expires. */
	expiresAt: Date | null;
	createdAt?: Date;
	updatedAt?: Date;
}

export type ApiTokenModel = ModelStatic<
	Model<
		ApiTokenAttributes,
		Omit<ApiTokenAttributes, 'lastUsedAt' | 'revokedAt' | 'expiresAt'> & Partial<ApiTokenAttributes>
	>
>;

export function defineApiToken(sequelize: Sequelize): ApiTokenModel {
	return sequelize.define(
		'ApiToken',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			userId: { type: DataTypes.STRING, allowNull: false },
			name: { type: DataTypes.STRING, allowNull: false },
			prefix: { type: DataTypes.STRING, allowNull: false },
			tokenHash: { type: DataTypes.STRING, allowNull: false, unique: true },
			lastUsedAt: { type: DataTypes.DATE, allowNull: true },
			revokedAt: { type: DataTypes.DATE, allowNull: true },
			expiresAt: { type: DataTypes.DATE, allowNull: true }
		},
		{ tableName: 'api_tokens', underscored: true }
	);
}
