/**
 * Notices about a claim's record — a certificate issued or superseded, the claim withdrawn — to
 * the claim's author and the group's leads, queued in the transaction of the event itself.
 */
import type { Transaction } from 'sequelize';
import type { Database } from '../db';
import type { EvidenceManifest } from '$lib/evidence/manifest';
import { isTrialsManifest } from '$lib/evidence/trials-evidence';
import type { CertificateAttributes } from '../db/models/Certificate';
import type { ClaimAttributes } from '../db/models/Claim';
import { mailLink } from './mail';
import { renderTemplate } from './templates';
import { queueRendered } from './mail-queue';
import { noticeCheckpoint, withCheckpoint } from './notice-checkpoint';

interface Recipient {
	email: string;
	name: string;
}

/** The claim's author and every lead of its group, each once. */
async function recipients(
	database: Database,
	claim: ClaimAttributes,
	transaction: Transaction
): Promise<Recipient[]> {
	const { Membership, User } = database.models;
	const leads = await Membership.findAll({
		where: { groupId: claim.groupId, role: 'lead' },
		transaction
	});
	const ids = new Set([claim.createdBy, ...leads.map((m) => m.get('userId') as string)]);
	const users = await User.findAll({ where: { id: [...ids] }, transaction });
	return users.map((u) => ({ email: u.get('email') as string, name: u.get('name') as string }));
}

async function context(database: Database, claimId: string, transaction: Transaction) {
	const claim = (await database.models.Claim.findByPk(claimId, { transaction }))!.get({
		plain: true
	});
	const group = (await database.models.Group.findByPk(claim.groupId, { transaction }))!;
	const link = mailLink(`/claims/${claim.id}`);
	return { claim, group: group.get('name') as string, link };
}

/** One notice per issue: "issued", or "superseded" when it replaces an earlier certificate. */
export async function queueCertificateNotice(
	database: Database,
	certificate: Pick<CertificateAttributes, 'claimId' | 'manifest' | 'fingerprint' | 'supersedes'>,
	transaction: Transaction
): Promise<void> {
	const { claim, group, link } = await context(database, certificate.claimId, transaction);
	const { Certificate } = database.models;
	// What the certificate states: an exploratory one is at its corrected level, not the check's.
	const m = JSON.parse(certificate.manifest) as EvidenceManifest;
	const r = m.result;
	// A certificate from time-ordered trials says so (issue 20): it rests on another assumption.
	const kind = isTrialsManifest(m)
		? ' from time-ordered trials, without the i.i.d. assumption'
		: '';
	const summary = `Schmidt number at least ${r.certifiedSchmidtNumber} in local dimension ${r.dimension}, certified at confidence ${r.confidence}${kind}`;
	const earlier = certificate.supersedes
		? await Certificate.findByPk(certificate.supersedes, { transaction })
		: null;
	const template = earlier ? 'certificate-superseded' : 'certificate-issued';
	const fingerprint =
		(earlier?.get('fingerprint') as string | undefined) ?? certificate.fingerprint;
	const checkpoint = await noticeCheckpoint(database, transaction);
	for (const to of await recipients(database, claim, transaction)) {
		const values = { name: to.name, title: claim.title, group, summary, fingerprint, link };
		const mail = withCheckpoint(renderTemplate(template, values), checkpoint);
		await queueRendered(database, transaction, to.email, template, mail);
	}
}

/** Tells the author and the leads who withdrew the claim and why. */
export async function queueWithdrawalNotice(
	database: Database,
	claimId: string,
	by: string,
	reason: string,
	transaction: Transaction
): Promise<void> {
	const { claim, group } = await context(database, claimId, transaction);
	const link = mailLink(`/archive?q=${encodeURIComponent(claim.id)}`);
	const checkpoint = await noticeCheckpoint(database, transaction);
	for (const to of await recipients(database, claim, transaction)) {
		const values = { name: to.name, title: claim.title, group, by, reason, link };
		const mail = withCheckpoint(renderTemplate('claim-withdrawn', values), checkpoint);
		await queueRendered(database, transaction, to.email, 'claim-withdrawn', mail);
	}
}
