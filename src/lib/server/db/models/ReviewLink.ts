import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

/** A referee's way in to one shared claim; only the SHA-256 of its token is kept. */
export interface ReviewLinkAttributes {
	id: string;
	shareId: string;
	claimId: string;
	tokenHash: string;
	/** The editor's private note (who the referee is); never shown to authors. */
	label: string | null;
	expiresAt: Date;
	revokedAt: Date | null;
	createdBy: string;
	/** The certificate current when the link was made (migration 0011): what the referee reviews. */
	certificateId?: string | null;
	createdAt?: Date;
	updatedAt?: Date;
}

export type ReviewLinkModel = ModelStatic<
	Model<
		ReviewLinkAttributes,
		Omit<ReviewLinkAttributes, 'revokedAt'> & Partial<ReviewLinkAttributes>
	>
>;

export function defineReviewLink(sequelize: Sequelize): ReviewLinkModel {
	return sequelize.define(
		'ReviewLink',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			shareId: { type: DataTypes.STRING, allowNull: false },
			claimId: { type: DataTypes.STRING, allowNull: false },
			tokenHash: { type: DataTypes.STRING, allowNull: false, unique: true },
			label: { type: DataTypes.TEXT, allowNull: true },
			expiresAt: { type: DataTypes.DATE, allowNull: false },
			revokedAt: { type: DataTypes.DATE, allowNull: true },
			createdBy: { type: DataTypes.STRING, allowNull: false },
			certificateId: { type: DataTypes.STRING, allowNull: true }
		},
		{ tableName: 'review_links', underscored: true }
	);
}
