import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

/**
 * queued: metadata waits to be sent; sending: an attempt is under way (or the process stopped
 * during one); retrying: the last attempt failed, `nextAttemptAt` says when the next is; failed:
 * given up (the registry refused the metadata, or 12 attempts failed; the next change of the
 * certificate or the next start tries again); done: the registry holds revision `sentRevision`.
 */
export type DoiStatus = 'queued' | 'sending' | 'retrying' | 'failed' | 'done';

/** One person named as a creator when the certificate was issued (ORCID is looked up when sent). */
export interface DoiCreator {
	userId: string | null;
	name: string;
}

/** A certificate's DOI, fixed at issue, and the outbox state of its registration at the registry. */
export interface CertificateDoiAttributes {
	certificateId: string;
	doi: string;
	/** JSON of DoiCreator[], in the certificate's author order. */
	creators: string;
	status: DoiStatus;
	/** Bumped by every change the registry must learn (issue, supersede, withdraw). */
	revision: number;
	/** The revision the registry last accepted (0: never registered). */
	sentRevision: number;
	attempts: number;
	nextAttemptAt: Date | null;
	lastError: string | null;
	/** When the registry first accepted it. */
	registeredAt: Date | null;
	createdAt?: Date;
	updatedAt?: Date;
}

export type CertificateDoiModel = ModelStatic<Model<CertificateDoiAttributes>>;

export function defineCertificateDoi(sequelize: Sequelize): CertificateDoiModel {
	// A fresh object each: Sequelize writes the column name into an attribute's definition.
	const integer = (defaultValue = 0) => ({
		type: DataTypes.INTEGER,
		allowNull: false,
		defaultValue
	});
	return sequelize.define(
		'CertificateDoi',
		{
			certificateId: { type: DataTypes.STRING, primaryKey: true },
			doi: { type: DataTypes.STRING, allowNull: false, unique: true },
			creators: { type: DataTypes.TEXT, allowNull: false },
			status: { type: DataTypes.STRING, allowNull: false },
			revision: integer(1),
			sentRevision: integer(),
			attempts: integer(),
			nextAttemptAt: { type: DataTypes.DATE, allowNull: true },
			lastError: { type: DataTypes.TEXT, allowNull: true },
			registeredAt: { type: DataTypes.DATE, allowNull: true }
		},
		{ tableName: 'certificate_dois', underscored: true }
	);
}
