/**
 * Who issued or withdrew a certificate, as the public ledger names them: by role ("group lead",
 * "author", "admin"), never by account. New entries record the role (`byRole`, `issuerRole`) and,
 * for issuing, a salted digest that binds the issuer for `ledger:verify` (issuer-digest.ts).
 * Entries written before that recorded the account's id (`by`, `issuedBy`); the public page shows
 * them with the role in its place, saying so in `redacted` (their hash and signature are of the
 * stored payload, which the operator's `npm run ledger:verify` still checks; the chain of hashes
 * stays checkable by anyone).
 */
import type { Transaction } from 'sequelize';
import { canonicalJson } from '../../evidence/canonical';
import type { Database } from '../db';
import { listLedger, type LedgerEntryView, type LedgerPayload } from './ledger';

export type LedgerRole = 'group lead' | 'author' | 'admin' | 'former member';

/** The role the account has (or had) in the certificate's group. */
export async function ledgerRole(
	database: Database,
	userId: string,
	groupId: string,
	transaction?: Transaction
): Promise<LedgerRole> {
	const { Membership, User } = database.models;
	const membership = await Membership.findOne({ where: { groupId, userId }, transaction });
	if (membership) return membership.get('role') === 'lead' ? 'group lead' : 'author';
	const user = await User.findByPk(userId, { transaction });
	return user?.get('accountRole') === 'admin' ? 'admin' : 'former member';
}

export type PublicLedgerEntry = LedgerEntryView & {
	/** Payload fields shown otherwise than signed (an old entry's account id as a role). */
	redacted: string[];
};

async function groupOfCertificate(database: Database, certificateId: string) {
	const certificate = await database.models.Certificate.findByPk(certificateId);
	const claim =
		certificate && (await database.models.Claim.findByPk(certificate.get('claimId') as string));
	return (claim?.get('groupId') as string | undefined) ?? '';
}

/** Old entries' account-id fields and the role field shown in their place. */
const ACCOUNT_FIELDS = { withdraw: ['by', 'byRole'], issue: ['issuedBy', 'issuerRole'] } as const;

async function publicEntry(database: Database, entry: LedgerEntryView): Promise<PublicLedgerEntry> {
	const fields = ACCOUNT_FIELDS[entry.event as keyof typeof ACCOUNT_FIELDS];
	if (!fields || entry.certificateId === null) return { ...entry, redacted: [] };
	const [accountField, roleField] = fields;
	const payload = JSON.parse(entry.payload) as LedgerPayload;
	const { [accountField]: account, ...details } = payload.details;
	if (typeof account !== 'string') return { ...entry, redacted: [] };
	const groupId = await groupOfCertificate(database, entry.certificateId);
	const role = await ledgerRole(database, account, groupId);
	const shown = canonicalJson({ ...payload, details: { ...details, [roleField]: role } });
	return { ...entry, payload: shown, redacted: [`details.${accountField}`] };
}

/** One page of the ledger as the public sees it. */
export async function publicLedgerPage(database: Database, page: number, pageSize: number) {
	const listed = await listLedger(database, page, pageSize);
	const items: PublicLedgerEntry[] = [];
	for (const entry of listed.items) items.push(await publicEntry(database, entry));
	return { ...listed, items };
}
