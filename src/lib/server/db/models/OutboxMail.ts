import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

/**
 * queued: waiting for its first try; sending: an attempt is under way (or the process stopped
 * during one); retrying: the last attempt failed, `nextAttemptAt` says when the next is; failed:
 * given up after the last allowed attempt (an admin may queue it again); sent: the server took it;
 * held: over the per-recipient cap when written, never tried (an admin may queue it).
 */
export type OutboxStatus = 'queued' | 'sending' | 'retrying' | 'failed' | 'sent' | 'held';

/** One e-mail written in the same transaction as the event that causes it. */
export interface OutboxMailAttributes {
	id: string;
	/** The template it was written from (verify-email, invitation, …). */
	kind: string;
	to: string;
	subject: string;
	text: string;
	html: string;
	status: OutboxStatus;
	attempts: number;
	nextAttemptAt: Date | null;
	lastError: string | null;
	sentAt: Date | null;
	createdAt?: Date;
	updatedAt?: Date;
}

export type OutboxMailModel = ModelStatic<Model<OutboxMailAttributes>>;

export function defineOutboxMail(sequelize: Sequelize): OutboxMailModel {
	return sequelize.define(
		'OutboxMail',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			kind: { type: DataTypes.STRING, allowNull: false },
			to: { type: DataTypes.TEXT, allowNull: false },
			subject: { type: DataTypes.TEXT, allowNull: false },
			text: { type: DataTypes.TEXT, allowNull: false },
			html: { type: DataTypes.TEXT, allowNull: false },
			status: { type: DataTypes.STRING, allowNull: false },
			attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
			nextAttemptAt: { type: DataTypes.DATE, allowNull: true },
			lastError: { type: DataTypes.TEXT, allowNull: true },
			sentAt: { type: DataTypes.DATE, allowNull: true }
		},
		{ tableName: 'outbox_mails', underscored: true }
	);
}
