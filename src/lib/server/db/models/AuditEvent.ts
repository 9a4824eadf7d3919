import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

export interface AuditEventAttributes {
	id: string;
	actorId: string | null;
	groupId: string | null;
	action: string;
	subjectType: string;
	subjectId: string | null;
	details: Record<string, unknown>;
	createdAt?: Date;
}

export type AuditEventModel = ModelStatic<Model<AuditEventAttributes>>;

export function defineAuditEvent(sequelize: Sequelize): AuditEventModel {
	return sequelize.define(
		'AuditEvent',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			actorId: { type: DataTypes.STRING, allowNull: true },
			groupId: { type: DataTypes.STRING, allowNull: true },
			action: { type: DataTypes.STRING, allowNull: false },
			subjectType: { type: DataTypes.STRING, allowNull: false },
			subjectId: { type: DataTypes.STRING, allowNull: true },
			details: { type: DataTypes.JSON, allowNull: false, defaultValue: {} }
		},
		{ tableName: 'audit_events', underscored: true, updatedAt: false }
	);
}
