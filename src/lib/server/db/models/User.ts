import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

/** Account-level role; author and group lead are roles within a group (Membership). */
export type AccountRole = 'researcher' | 'editor' | 'admin';

export interface UserAttributes {
	id: string;
	email: string;
	name: string;
	passwordHash: string;
	accountRole: AccountRole;
	emailVerifiedAt: Date | null;
	/** ORCID iD as 0000-0002-1825-0097, linked only after a password sign-in (migration 0022). */
	orcid?: string | null;
	createdAt?: Date;
	updatedAt?: Date;
}

export type UserModel = ModelStatic<
	Model<UserAttributes, Omit<UserAttributes, 'emailVerifiedAt'> & Partial<UserAttributes>>
>;

export function defineUser(sequelize: Sequelize): UserModel {
	return sequelize.define(
		'User',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			email: { type: DataTypes.STRING, allowNull: false, unique: true },
			name: { type: DataTypes.STRING, allowNull: false },
			passwordHash: { type: DataTypes.STRING, allowNull: false },
			accountRole: { type: DataTypes.STRING, allowNull: false, defaultValue: 'researcher' },
			emailVerifiedAt: { type: DataTypes.DATE, allowNull: true },
			orcid: { type: DataTypes.STRING, allowNull: true, unique: true }
		},
		{ tableName: 'users', underscored: true }
	);
}
