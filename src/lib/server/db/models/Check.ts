import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';
import type { CertificationResult } from '$lib/certify';
import type { CountsAdvice } from '$lib/certify/planner/check-counts';

import { CHECK_STATUSES, type CheckStatus } from '$lib/views/checks';

export { CHECK_STATUSES, type CheckStatus };
/** Statuses that hold a worker slot or a place in the queue. */
export const ACTIVE_CHECK_STATUSES: CheckStatus[] = ['queued', 'running'];

/** One run of the engine on a dataset, with its recorded settings and result. */
export interface CheckAttributes {
	id: string;
	claimId: string;
	datasetId: string;
	createdBy: string | null;
	status: CheckStatus;
	progress: number;
	resamples: number;
	confidence: number;
	seed: number;
	/** Accidentals subtracted before normalising (migration 0004); the result says so. */
	subtractAccidentals?: boolean;
	/** The review link that started this re-run (migration 0008); its own queue and limit. */
	reviewLinkId?: string | null;
	cancelledAt?: Date | null;
	/** The account that cancelled it; null with cancelledAt set: the referee's link. */
	cancelledBy?: string | null;
	/** Times the runner started it (migration 0010); a clean stop gives its start back. */
	attempts?: number;
	result: CertificationResult | null;
	/** Counts needed for an unsupported claim (migration 0024), simulated after the check. */
	countsAdvice?: CountsAdvice | null;
	error: string | null;
	startedAt: Date | null;
	finishedAt: Date | null;
	createdAt?: Date;
	updatedAt?: Date;
}

type Optional = 'status' | 'progress' | 'result' | 'error' | 'startedAt' | 'finishedAt';
export type CheckModel = ModelStatic<
	Model<CheckAttributes, Omit<CheckAttributes, Optional> & Partial<CheckAttributes>>
>;

export function defineCheck(sequelize: Sequelize): CheckModel {
	return sequelize.define(
		'Check',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			claimId: { type: DataTypes.STRING, allowNull: false },
			datasetId: { type: DataTypes.STRING, allowNull: false },
			createdBy: { type: DataTypes.STRING, allowNull: true },
			status: { type: DataTypes.STRING, allowNull: false, defaultValue: 'queued' },
			progress: { type: DataTypes.FLOAT, allowNull: false, defaultValue: 0 },
			resamples: { type: DataTypes.INTEGER, allowNull: false },
			confidence: { type: DataTypes.FLOAT, allowNull: false },
			seed: { type: DataTypes.BIGINT, allowNull: false },
			subtractAccidentals: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
			reviewLinkId: { type: DataTypes.STRING, allowNull: true },
			cancelledAt: { type: DataTypes.DATE, allowNull: true },
			cancelledBy: { type: DataTypes.STRING, allowNull: true },
			attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
			result: { type: DataTypes.JSON, allowNull: true },
			countsAdvice: { type: DataTypes.JSON, allowNull: true },
			error: { type: DataTypes.TEXT, allowNull: true },
			startedAt: { type: DataTypes.DATE, allowNull: true },
			finishedAt: { type: DataTypes.DATE, allowNull: true }
		},
		{ tableName: 'checks', underscored: true }
	);
}
