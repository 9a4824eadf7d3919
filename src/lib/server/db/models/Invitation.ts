import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';
import type { GroupRole } from './Membership';

export interface InvitationAttributes {
	id: string;
	groupId: string;
	email: string;
	role: GroupRole;
	tokenHash: string;
	invitedBy: string;
	expiresAt: Date;
	acceptedAt: Date | null;
	createdAt?: Date;
	updatedAt?: Date;
}

export type InvitationModel = ModelStatic<
	Model<
		InvitationAttributes,
		Omit<InvitationAttributes, 'acceptedAt'> & Partial<InvitationAttributes>
	>
>;

export function defineInvitation(sequelize: Sequelize): InvitationModel {
	return sequelize.define(
		'Invitation',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			groupId: { type: DataTypes.STRING, allowNull: false },
			email: { type: DataTypes.STRING, allowNull: false },
			role: { type: DataTypes.STRING, allowNull: false },
			tokenHash: { type: DataTypes.STRING, allowNull: false, unique: true },
			invitedBy: { type: DataTypes.STRING, allowNull: false },
			expiresAt: { type: DataTypes.DATE, allowNull: false },
			acceptedAt: { type: DataTypes.DATE, allowNull: true }
		},
		{ tableName: 'invitations', underscored: true }
	);
}
