import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';
import type { DatasetSummary, PreviewTable } from '$lib/views/datasets';

export type { DatasetSummary, PreviewTable };

export interface DatasetAttributes {
	id: string;
	claimId: string;
	createdBy: string;
	sha256: string;
	byteSize: number;
	format: 'csv' | 'json';
	originalName: string;
	summary: DatasetSummary;
	/** Heat-map tables, written at upload (migration 0004); null for rows older than that until viewed. */
	preview?: PreviewTable[] | null;
	/** SHA-256 of the canonical counts text (migration 0011): equal counts, one file; null until read. */
	countsSha256?: string | null;
	/** The calibration file as uploaded beside the counts (migration 0016), and its SHA-256. */
	calibration?: Uint8Array | null;
	calibrationSha256?: string | null;
	createdAt?: Date;
	updatedAt?: Date;
}

export type DatasetModel = ModelStatic<Model<DatasetAttributes>>;

export function defineDataset(sequelize: Sequelize): DatasetModel {
	return sequelize.define(
		'Dataset',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			claimId: { type: DataTypes.STRING, allowNull: false },
			createdBy: { type: DataTypes.STRING, allowNull: false },
			sha256: { type: DataTypes.STRING(64), allowNull: false },
			byteSize: { type: DataTypes.INTEGER, allowNull: false },
			format: { type: DataTypes.STRING, allowNull: false },
			originalName: { type: DataTypes.STRING, allowNull: false },
			summary: { type: DataTypes.JSON, allowNull: false },
			preview: { type: DataTypes.JSON, allowNull: true },
			countsSha256: { type: DataTypes.STRING(64), allowNull: true },
			calibration: { type: DataTypes.BLOB, allowNull: true },
			calibrationSha256: { type: DataTypes.STRING(64), allowNull: true }
		},
		{ tableName: 'datasets', underscored: true }
	);
}
