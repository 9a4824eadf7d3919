import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';
import type { FourierConvention } from '$lib/certify';
import type { ClaimState } from '$lib/claims/states';
import type { ClaimMethod, TargetSource } from '$lib/claims/target';

export type { ClaimState };

export interface ClaimAttributes {
	id: string;
	groupId: string;
	createdBy: string;
	title: string;
	sourceDescription: string;
	dimension: number;
	method: ClaimMethod;
	/** Bases used by the method, e.g. [0, 1]; stored as JSON text. */
	bases: number[];
	/** Which Fourier basis basis 1 is: cyclic (ℤ_d) or field (GF(p^s)). */
	fourier: FourierConvention;
	claimedSchmidtNumber: number;
	manuscriptReference: string | null;
	state: ClaimState;
	/** Why and when the group withdrew the claim (migration 0007); null while it stands. */
	withdrawnReason?: string | null;
	withdrawnAt?: Date | null;
	/** Time-ordered trials (migration 0018): per-trial or per-block bets; null for a counts claim. */
	trialsMode?: 'trials' | 'blocks' | null;
	/** π_t in the order of `bases`, JSON text; null: uniform. */
	trialsProbabilities?: number[] | null;
	/** fidelity-target (migration 0020): λ with Σλ² = 1, JSON text; null for other methods. */
	target?: number[] | null;
	/** λ as declared when the service scaled it to Σλ² = 1; null when it was declared normalised. */
	targetDeclared?: number[] | null;
	/** Where λ comes from (migration 0025): null or 'declared' with the claim, or a calibration run. */
	targetSource?: TargetSource | null;
	/** The calibration run as uploaded, its SHA-256 and file name; null until it is given. */
	targetRun?: Uint8Array | null;
	targetRunSha256?: string | null;
	targetRunName?: string | null;
	/** The fit that froze λ: the run's matching counts N_mm (JSON text). */
	targetFit?: { method: 'diagonal-share'; diagonal: number[] } | null;
	createdAt?: Date;
	updatedAt?: Date;
}

/**
 * Every column but the calibration run's bytes (up to the counts-file limit each): for queries that
 * read many claims and never the run (lists, the archive, analyses), so that a page of claims does
 * not pull their runs into memory.
 */
export const CLAIM_WITHOUT_RUN = { exclude: ['targetRun'] };

export type ClaimModel = ModelStatic<
	Model<
		ClaimAttributes,
		Omit<ClaimAttributes, 'state' | 'manuscriptReference' | 'fourier'> & Partial<ClaimAttributes>
	>
>;

export function defineClaim(sequelize: Sequelize): ClaimModel {
	return sequelize.define(
		'Claim',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			groupId: { type: DataTypes.STRING, allowNull: false },
			createdBy: { type: DataTypes.STRING, allowNull: false },
			title: { type: DataTypes.STRING, allowNull: false },
			sourceDescription: { type: DataTypes.TEXT, allowNull: false },
			dimension: { type: DataTypes.INTEGER, allowNull: false },
			method: { type: DataTypes.STRING, allowNull: false },
			bases: {
				type: DataTypes.TEXT,
				allowNull: false,
				get() {
					return JSON.parse(this.getDataValue('bases') as unknown as string);
				},
				set(value: number[]) {
					this.setDataValue('bases', JSON.stringify(value) as unknown as number[]);
				}
			},
			fourier: { type: DataTypes.STRING, allowNull: false, defaultValue: 'cyclic' },
			claimedSchmidtNumber: { type: DataTypes.INTEGER, allowNull: false },
			manuscriptReference: { type: DataTypes.STRING, allowNull: true },
			state: { type: DataTypes.STRING, allowNull: false, defaultValue: 'draft' },
			withdrawnReason: { type: DataTypes.TEXT, allowNull: true },
			withdrawnAt: { type: DataTypes.DATE, allowNull: true },
			trialsMode: { type: DataTypes.STRING, allowNull: true },
			trialsProbabilities: {
				type: DataTypes.TEXT,
				allowNull: true,
				get() {
					const text = this.getDataValue('trialsProbabilities') as unknown as string | null;
					return text ? JSON.parse(text) : null;
				},
				set(value: number[] | null) {
					const text = value ? JSON.stringify(value) : null;
					this.setDataValue('trialsProbabilities', text as unknown as number[] | null);
				}
			},
			target: jsonText('target'),
			targetDeclared: jsonText('targetDeclared'),
			targetSource: { type: DataTypes.STRING, allowNull: true },
			targetRun: { type: DataTypes.BLOB, allowNull: true },
			targetRunSha256: { type: DataTypes.STRING(64), allowNull: true },
			targetRunName: { type: DataTypes.STRING, allowNull: true },
			targetFit: jsonText('targetFit')
		},
		{ tableName: 'claims', underscored: true }
	);
}

/** A list of numbers (or the fit) kept as JSON text. */
function jsonText(key: 'target' | 'targetDeclared' | 'targetFit') {
	return {
		type: DataTypes.TEXT,
		allowNull: true,
		get(this: Model<ClaimAttributes>) {
			const text = this.getDataValue(key) as unknown as string | null;
			return text ? JSON.parse(text) : null;
		},
		set(this: Model<ClaimAttributes>, value: unknown) {
			this.setDataValue(key, (value ? JSON.stringify(value) : null) as never);
		}
	};
}
