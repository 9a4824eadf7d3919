import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

import type { CertificateStatus } from '$lib/views/certificates';

export type { CertificateStatus };

/**
 * A signed certificate. Never changed after issue except `status` and `supersededBy`; every
 * other column is bound by the signed manifest or the ledger, so a hand edit is detected.
 */
export interface CertificateAttributes {
	id: string;
	claimId: string;
	checkId: string;
	/** SHA-256 of `manifest`. */
	fingerprint: string;
	/** The canonical manifest text that was signed. */
	manifest: string;
	signature: string;
	keyId: string;
	status: CertificateStatus;
	supersedes: string | null;
	supersededBy: string | null;
	/** Files under the data folder, relative to it. */
	pdfPath: string;
	pdfSha256: string;
	bundlePath: string;
	bundleSha256: string;
	issuedBy: string | null;
	issuedAt: Date;
	createdAt?: Date;
	updatedAt?: Date;
}

export type CertificateModel = ModelStatic<Model<CertificateAttributes>>;

export function defineCertificate(sequelize: Sequelize): CertificateModel {
	const string = (allowNull = false) => ({ type: DataTypes.STRING, allowNull });
	return sequelize.define(
		'Certificate',
		{
			id: { type: DataTypes.STRING, primaryKey: true },
			claimId: string(),
			checkId: string(),
			fingerprint: string(),
			manifest: { type: DataTypes.TEXT, allowNull: false },
			signature: string(),
			keyId: string(),
			status: string(),
			supersedes: string(true),
			supersededBy: string(true),
			pdfPath: { type: DataTypes.TEXT, allowNull: false },
			pdfSha256: string(),
			bundlePath: { type: DataTypes.TEXT, allowNull: false },
			bundleSha256: string(),
			issuedBy: string(true),
			issuedAt: { type: DataTypes.DATE, allowNull: false }
		},
		{ tableName: 'certificates', underscored: true }
	);
}
