import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';
import { RECOMMENDATIONS, type Recommendation } from '$lib/review/recommendations';

export { RECOMMENDATIONS, type Recommendation };

/** A referee's report through one review link: a draft until submitted, then fixed. */
export interface ReportAttributes {
	id: string;
	reviewLinkId: string;
	claimId: string;
	recommendation: Recommendation;
	comments: string;
	submittedAt: Date | null;
	/** When the editor let the authors read it. */
	releasedAt: Date | null;
	createdAt?: Date;
	updatedAt?: Date;
}

export type ReportModel = ModelStatic<
	Model<
		ReportAttributes,
		Omit<ReportAttributes, 'submittedAt' | 'releasedAt'> & Partial<ReportAttributes>
	>
>;

export function defineReport(sequelize: Sequelize): ReportModel {
	return sequelize.define(
		'Report',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			reviewLinkId: { type: DataTypes.STRING, allowNull: false, unique: true },
			claimId: { type: DataTypes.STRING, allowNull: false },
			recommendation: { type: DataTypes.STRING, allowNull: false },
			comments: { type: DataTypes.TEXT, allowNull: false },
			submittedAt: { type: DataTypes.DATE, allowNull: true },
			releasedAt: { type: DataTypes.DATE, allowNull: true }
		},
		{ tableName: 'reports', underscored: true }
	);
}
