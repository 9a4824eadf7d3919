import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

/** A certified claim shared with a journal editor, by address (the account may come later). */
export interface ShareAttributes {
	id: string;
	claimId: string;
	editorEmail: string;
	editorId: string | null;
	journal: string;
	manuscript: string;
	tokenHash: string;
	sharedBy: string;
	withdrawnAt: Date | null;
	/** When the editor first opened the notice's link (migration 0015); null until then. */
	openedAt?: Date | null;
	createdAt?: Date;
	updatedAt?: Date;
}

export type ShareModel = ModelStatic<
	Model<
		ShareAttributes,
		Omit<ShareAttributes, 'editorId' | 'withdrawnAt'> & Partial<ShareAttributes>
	>
>;

export function defineShare(sequelize: Sequelize): ShareModel {
	return sequelize.define(
		'Share',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			claimId: { type: DataTypes.STRING, allowNull: false },
			editorEmail: { type: DataTypes.STRING, allowNull: false },
			editorId: { type: DataTypes.STRING, allowNull: true },
			journal: { type: DataTypes.TEXT, allowNull: false },
			manuscript: { type: DataTypes.TEXT, allowNull: false },
			tokenHash: { type: DataTypes.STRING, allowNull: false, unique: true },
			sharedBy: { type: DataTypes.STRING, allowNull: false },
			withdrawnAt: { type: DataTypes.DATE, allowNull: true },
			openedAt: { type: DataTypes.DATE, allowNull: true }
		},
		{ tableName: 'shares', underscored: true }
	);
}
