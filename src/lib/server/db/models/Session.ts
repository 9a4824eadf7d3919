import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

export interface SessionAttributes {
	id: string;
	userId: string;
	expiresAt: Date;
}

export type SessionModel = ModelStatic<Model<SessionAttributes>>;

export function defineSession(sequelize: Sequelize): SessionModel {
	return sequelize.define(
		'Session',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			userId: { type: DataTypes.STRING, allowNull: false },
			expiresAt: { type: DataTypes.DATE, allowNull: false }
		},
		{ tableName: 'sessions', underscored: true, timestamps: false }
	);
}
