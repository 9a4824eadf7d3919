/**
 * The authorisation matrix's world, written into a fresh data folder before the built app starts:
 * one complete, separate kit per kind of caller (groups, people, a certified and shared claim,
 * review links, tokens, invitations …), so that what one column changes never reaches another.
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { openDatabase, type Database } from '../../src/lib/server/db';
import { audit } from '../../src/lib/server/core/audit';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { issueEmailToken } from '../../src/lib/server/accounts/email-tokens';
import { newId, newSecret } from '../../src/lib/server/core/ids';
import { createReviewLink, revokeReviewLink } from '../../src/lib/server/review/review-links';
import { apiToken, asUser, DAY, doneCheck, member, person } from './matrix-parts';
import { preparePasswords, share, tokenOf } from './matrix-parts';

export { doneCheck, MATRIX_PASSWORD } from './matrix-parts';

type Counts = ReturnType<typeof sampledCounts>;
export type Kit = Awaited<ReturnType<typeof seedKit>>;

/** Two groups: the claim's (lead, author, a spare member) and another's (its lead); editors, admin. */
async function seedPeople(db: Database, tag: string) {
	const lake = newId();
	const ridge = newId();
	await db.models.Group.create({ id: lake, name: `Lake optics ${tag}` });
	await db.models.Group.create({ id: ridge, name: `Ridge qudits ${tag}` });
	const lead = await person(db, tag, 'lead');
	const author = await person(db, tag, 'author');
	const spare = await person(db, tag, 'spare');
	const other = await person(db, tag, 'other');
	const editor = await person(db, tag, 'editor', 'editor');
	const stranger = await person(db, tag, 'stranger', 'editor');
	const admin = await person(db, tag, 'admin', 'admin');
	await member(db, lake, lead.id, 'lead');
	await member(db, lake, author.id, 'author');
	await member(db, lake, spare.id, 'author');
	await member(db, ridge, other.id, 'lead');
	return { tag, lake, ridge, lead, author, spare, other, editor, stranger, admin };
}
type People = Awaited<ReturnType<typeof seedPeople>>;

/** The certified claim (three counts files, four done checks) and an uncertified spare claim. */
async function seedClaims(db: Database, { tag, author }: People, counts: Counts) {
	const fields = { dimension: 5, method: 'mub-correlation' as const, manuscriptReference: null };
	const claim = await createClaim(db, asUser(author.id), {
		...{ title: `Fibre pairs ${tag}`, sourceDescription: 'Simulated pairs, visibility 0.9.' },
		...{ ...fields, bases: [0, 1, 2], claimedSchmidtNumber: 3 }
	});
	const spareClaim = await createClaim(db, asUser(author.id), {
		...{ title: `Spare claim ${tag}`, sourceDescription: 'Edited and withdrawn.' },
		...{ ...fields, bases: [0, 1], claimedSchmidtNumber: 2 }
	});
	const upload = (name: string) =>
		addDataset(db, asUser(author.id), claim.id, {
			bytes: new TextEncoder().encode(toCountsCsv(counts, [`${tag} ${name}`])),
			originalName: name
		});
	const dataset = await upload('fibre.csv');
	const spareDatasets = [(await upload('spare-a.csv')).id, (await upload('spare-b.csv')).id];
	const checks: string[] = [];
	for (let i = 0; i < 4; i++) checks.push(await doneCheck(db, claim.id, dataset.id, author.id));
	const certificate = await issueCertificate(db, asUser(author.id), claim.id, checks[0]);
	const ids = { claimId: claim.id, spareClaimId: spareClaim.id, datasetId: dataset.id };
	return { ...ids, spareDatasets, checks, certificateId: certificate.id };
}

/** Shares, review links in every state, filed reports and the valid link's own re-run. */
async function seedReview(db: Database, people: People, claimId: string, rerun: string) {
	const { tag, author, editor } = people;
	const at = (who: string) => ({ email: `${who}.${tag.toLowerCase()}@example.test` });
	const editorShare = await share(db, claimId, author.id, editor);
	const openShares = [];
	for (const who of ['new-editor', 'gone-a', 'gone-b'])
		openShares.push(await share(db, claimId, author.id, at(who)));
	const editorActor = asUser(editor.id, 'editor');
	const link = async () => {
		const made = await createReviewLink(db, editorActor, claimId, { label: 'referee' });
		return { id: made.id, token: tokenOf(made.url) };
	};
	// `second` is the valid link's twin for the API re-run: one re-run per link at a time.
	const links = {
		...{ valid: await link(), second: await link() },
		...{ expired: await link(), revoked: await link() }
	};
	const past = { expiresAt: new Date(Date.now() - 1000) };
	await db.models.ReviewLink.update(past, { where: { id: links.expired.id } });
	await revokeReviewLink(db, editorActor, links.revoked.id);
	const spareLinks = [await link(), await link(), await link(), await link()];
	const reports = [];
	for (const l of spareLinks.slice(2)) {
		const report = { id: newId(), reviewLinkId: l.id, claimId, recommendation: 'sound' as const };
		await db.models.Report.create({ ...report, comments: 'Sound.', submittedAt: new Date() });
		reports.push(report.id);
	}
	// The referee's own re-run, as startRefereeCheck records it (the row and the log).
	await db.models.Check.update({ reviewLinkId: links.valid.id }, { where: { id: rerun } });
	const started = { subjectType: 'check', subjectId: rerun, action: 'review.check-started' };
	await audit(db, { actorId: null, ...started, details: { reviewLinkId: links.valid.id } });
	return { editorShare, openShares, links, spareLinks, reports, rerun };
}

/** Invitations, e-mail tokens, a failed mail and the author's API tokens in every state. */
async function seedAccounts(db: Database, { tag, lake, lead, spare, author }: People) {
	const invitation = async () => {
		const { token, hash } = newSecret();
		const email = `invitee.${tag.toLowerCase()}@example.test`;
		const row = { id: newId(), groupId: lake, email, role: 'author' as const, tokenHash: hash };
		const expiresAt = new Date(Date.now() + DAY);
		await db.models.Invitation.create({ ...row, invitedBy: lead.id, expiresAt });
		return { id: row.id, token };
	};
	const invitations = [await invitation(), await invitation()];
	const verifyToken = await issueEmailToken(db, spare.id, 'verify-email', DAY);
	const resetToken = await issueEmailToken(db, spare.id, 'reset-password', DAY);
	const mailId = newId();
	await db.models.OutboxMail.create({
		...{ id: mailId, kind: 'verify-email', to: spare.email, subject: 'Confirm', text: 'x' },
		...{ html: '<p>x</p>', status: 'failed', attempts: 5, nextAttemptAt: null },
		...{ lastError: 'refused', sentAt: null }
	});
	const tokens = {
		valid: await apiToken(db, author.id, 'valid'),
		expired: await apiToken(db, author.id, 'expired'),
		revoked: await apiToken(db, author.id, 'revoked'),
		spare: [await apiToken(db, author.id, 'valid'), await apiToken(db, author.id, 'valid')]
	};
	return { invitations, verifyToken, resetToken, mailId, tokens };
}

/** One caller kind's complete world; `tag` keeps its addresses apart from the other kits'. */
async function seedKit(db: Database, tag: string, counts: Counts) {
	const people = await seedPeople(db, tag);
	const claims = await seedClaims(db, people, counts);
	const review = await seedReview(db, people, claims.claimId, claims.checks[3]);
	return { ...people, ...claims, ...review, ...(await seedAccounts(db, people)) };
}

export interface MatrixWorld {
	dataDir: string;
	kits: Record<string, Kit>;
}

/** A kit for each tag, in one SQLite file; the app is started on `dataDir` afterwards. */
export async function seedMatrixWorld(tags: readonly string[]): Promise<MatrixWorld> {
	const dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-matrix-'));
	const saved = { ...process.env };
	process.env.RANKSEAL_DATA_DIR = dataDir;
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	const counts = sampledCounts(states.isotropic(5, 0.9), [0, 1, 2], 40_000, 17);
	await preparePasswords();
	try {
		const kits: Record<string, Kit> = {};
		for (const tag of tags) kits[tag] = await seedKit(database, tag, counts);
		return { dataDir, kits };
	} finally {
		await database.sequelize.close();
		process.env = saved;
	}
}
