import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

export type EmailTokenPurpose = 'verify-email' | 'reset-password';

/** A single-use, expiring token sent by e-mail; only its SHA-256 is stored. */
export interface EmailTokenAttributes {
	id: string;
	userId: string;
	purpose: EmailTokenPurpose;
	tokenHash: string;
	expiresAt: Date;
	usedAt: Date | null;
	createdAt?: Date;
	updatedAt?: Date;
}

export type EmailTokenModel = ModelStatic<
	Model<EmailTokenAttributes, Omit<EmailTokenAttributes, 'usedAt'> & Partial<EmailTokenAttributes>>
>;

export function defineEmailToken(sequelize: Sequelize): EmailTokenModel {
	return sequelize.define(
		'EmailToken',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			userId: { type: DataTypes.STRING, allowNull: false },
			purpose: { type: DataTypes.STRING, allowNull: false },
			tokenHash: { type: DataTypes.STRING, allowNull: false, unique: true },
			expiresAt: { type: DataTypes.DATE, allowNull: false },
			usedAt: { type: DataTypes.DATE, allowNull: true }
		},
		{ tableName: 'email_tokens', underscored: true }
	);
}
