import { DataTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';

export type LedgerEvent = 'issue' | 'supersede' | 'withdraw' | 'key';

/**
 * One link of the append-only ledger (a certificate event, or a signing key's introduction): `payload` is canonical JSON naming the previous entry's
 * hash; `hash` is its SHA-256 and `signature` the service key's Ed25519 signature over it.
 */
export interface LedgerEntryAttributes {
	seq: number;
	event: LedgerEvent;
	certificateId: string | null;
	payload: string;
	prevHash: string;
	hash: string;
	keyId: string;
	signature: string;
	createdAt?: Date;
}

export type LedgerEntryModel = ModelStatic<Model<LedgerEntryAttributes>>;

export function defineLedgerEntry(sequelize: Sequelize): LedgerEntryModel {
	// A fresh object per column: Sequelize writes the column name into each definition.
	const string = () => ({ type: DataTypes.STRING, allowNull: false });
	return sequelize.define(
		'LedgerEntry',
		{
			seq: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: false },
			event: string(),
			// Null for a key introduction (migration 0012).
			certificateId: { type: DataTypes.STRING, allowNull: true },
			payload: { type: DataTypes.TEXT, allowNull: false },
			prevHash: string(),
			hash: string(),
			keyId: string(),
			signature: string()
		},
		{ tableName: 'ledger_entries', underscored: true, updatedAt: false }
	);
}
