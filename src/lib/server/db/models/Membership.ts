import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

export type GroupRole = 'lead' | 'author';

export interface MembershipAttributes {
	id: string;
	groupId: string;
	userId: string;
	role: GroupRole;
	createdAt?: Date;
	updatedAt?: Date;
}

export type MembershipModel = ModelStatic<Model<MembershipAttributes>>;

export function defineMembership(sequelize: Sequelize): MembershipModel {
	return sequelize.define(
		'Membership',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			groupId: { type: DataTypes.STRING, allowNull: false },
			userId: { type: DataTypes.STRING, allowNull: false },
			role: { type: DataTypes.STRING, allowNull: false }
		},
		{ tableName: 'memberships', underscored: true }
	);
}
