import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

/** A message received by the local mail catcher (development and demo), shown on the outbox page. */
export interface MailMessageAttributes {
	id: string;
	from: string;
	to: string;
	subject: string;
	text: string;
	html: string | null;
	raw: string;
	createdAt?: Date;
}

export type MailMessageModel = ModelStatic<Model<MailMessageAttributes>>;

export function defineMailMessage(sequelize: Sequelize): MailMessageModel {
	return sequelize.define(
		'MailMessage',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			from: { type: DataTypes.STRING, allowNull: false },
			to: { type: DataTypes.TEXT, allowNull: false },
			subject: { type: DataTypes.STRING, allowNull: false },
			text: { type: DataTypes.TEXT, allowNull: false },
			html: { type: DataTypes.TEXT, allowNull: true },
			raw: { type: DataTypes.TEXT, allowNull: false }
		},
		{ tableName: 'mail_messages', underscored: true, updatedAt: false }
	);
}
