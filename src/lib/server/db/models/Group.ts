import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

export interface GroupAttributes {
	id: string;
	name: string;
	createdAt?: Date;
	updatedAt?: Date;
}

export type GroupModel = ModelStatic<Model<GroupAttributes>>;

export function defineGroup(sequelize: Sequelize): GroupModel {
	return sequelize.define(
		'Group',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			name: { type: DataTypes.STRING, allowNull: false }
		},
		{ tableName: 'groups', underscored: true }
	);
}
