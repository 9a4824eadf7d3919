/**
 * The authorisation matrix's world, written into a fresh data folder before the built app starts:
 * one complete, separate kit per kind of caller (groups, people, a certified and shared claim,
 * review links, tokens, invitations …), so that what one column changes never reaches another.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { certify, parseCounts, sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import type { UserActor } from '../../src/lib/server/access/actor';
import { openDatabase, type Database } from '../../src/lib/server/db';
import type { AccountRole } from '../../src/lib/server/db/models/User';
import type { GroupRole } from '../../src/lib/server/db/models/Membership';
import { hashPassword } from '../../src/lib/server/auth';
import { audit } from '../../src/lib/server/services/audit';
import { issueCertificate } from '../../src/lib/server/services/certificates';
import { createClaim } from '../../src/lib/server/services/claims';
import { addDataset, datasetFilePath } from '../../src/lib/server/services/datasets';
import { issueEmailToken } from '../../src/lib/server/services/email-tokens';
import { newId, newSecret } from '../../src/lib/server/services/ids';
import { createReviewLink, revokeReviewLink } from '../../src/lib/server/services/review-links';

type Counts = ReturnType<typeof sampledCounts>;
export type Kit = Awaited<ReturnType<typeof seedKit>>;

const DAY = 86_400_000;
const asUser = (userId: string, accountRole: AccountRole = 'researcher'): UserActor => ({
	kind: 'user',
	userId,
	accountRole,
	emailVerified: true
});

/** Everyone has this password, so that sign-in answers as it would for any real account. */
export const MATRIX_PASSWORD = 'matrix pass phrase 2026';
let passwordHash: string;

async function person(db: Database, tag: string, name: string, role: AccountRole = 'researcher') {
	const id = newId();
	const email = `${name}.${tag.toLowerCase()}@example.test`;
	const user = { id, email, name, passwordHash, accountRole: role };
	await db.models.User.create({ ...user, emailVerifiedAt: new Date() });
	const session = newId().replaceAll('-', '');
	await db.models.Session.create({
		id: session,
		userId: id,
		expiresAt: new Date(Date.now() + DAY)
	});
	return { id, email, session };
}

async function member(db: Database, groupId: string, userId: string, role: GroupRole) {
	await db.models.Membership.create({ id: newId(), groupId, userId, role });
}

/** A done check holding the engine's own result, as the check runner stores it. */
export async function doneCheck(db: Database, claimId: string, datasetId: string, userId: string) {
	const claim = (await db.models.Claim.findByPk(claimId))!.get({ plain: true });
	const dataset = (await db.models.Dataset.findByPk(datasetId))!.get({ plain: true });
	const settings = { resamples: 200, confidence: 0.99, seed: 31 };
	const counts = parseCounts(readFileSync(datasetFilePath(dataset.sha256)), claim.dimension);
	const result = certify(counts, {
		...{ method: claim.method, bases: claim.bases, fourier: claim.fourier, ...settings },
		...{ claim: claim.claimedSchmidtNumber, inputSha256: dataset.sha256 }
	});
	const id = newId();
	const now = new Date();
	await db.models.Check.create({
		...{ id, claimId, datasetId, createdBy: userId, status: 'done', progress: 1 },
		...{ ...settings, result, startedAt: now, finishedAt: now }
	});
	return id;
}

async function share(db: Database, claimId: string, sharedBy: string, editor: { email: string }) {
	const { token, hash } = newSecret('shr_');
	const id = newId();
	const known = await db.models.User.findOne({ where: { email: editor.email } });
	await db.models.Share.create({
		...{ id, claimId, editorEmail: editor.email, editorId: (known?.get('id') as string) ?? null },
		...{ journal: 'J. Imag. Opt.', manuscript: 'JIO-1', tokenHash: hash, sharedBy }
	});
	return { id, token };
}

const tokenOf = (url: string) => url.slice(url.lastIndexOf('/') + 1);

async function apiToken(db: Database, userId: string, state: 'valid' | 'expired' | 'revoked') {
	const { token, hash } = newSecret('rks_');
	const id = newId();
	const expiresAt = new Date(Date.now() + (state === 'expired' ? -1000 : DAY));
	const revokedAt = state === 'revoked' ? new Date() : null;
	const row = { id, userId, name: `matrix ${state}`, prefix: token.slice(0, 12), tokenHash: hash };
	await db.models.ApiToken.create({ ...row, revokedAt, expiresAt });
	return { id, token };
}

/** One caller kind's complete world; `tag` keeps its addresses apart from the other kits'. */
async function seedKit(db: Database, tag: string, counts: Counts) {
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
	const claim = await createClaim(db, asUser(author.id), {
		...{ title: `Fibre pairs ${tag}`, sourceDescription: 'Simulated pairs, visibility 0.9.' },
		...{ dimension: 5, method: 'mub-correlation', bases: [0, 1, 2], claimedSchmidtNumber: 3 },
		manuscriptReference: null
	});
	const spareClaim = await createClaim(db, asUser(author.id), {
		...{ title: `Spare claim ${tag}`, sourceDescription: 'Withdrawn through the API.' },
		...{ dimension: 5, method: 'mub-correlation', bases: [0, 1], claimedSchmidtNumber: 2 },
		manuscriptReference: null
	});
	const upload = (name: string) =>
		addDataset(db, asUser(author.id), claim.id, {
			bytes: new TextEncoder().encode(toCountsCsv(counts, [`${tag} ${name}`])),
			originalName: name
		});
	const dataset = await upload('fibre.csv');
	const spareDatasets = [(await upload('spare-a.csv')).id, (await upload('spare-b.csv')).id];
	const checks = [];
	for (let i = 0; i < 3; i++) checks.push(await doneCheck(db, claim.id, dataset.id, author.id));
	const certificate = await issueCertificate(db, asUser(author.id), claim.id, checks[0]);
	const editorShare = await share(db, claim.id, author.id, editor);
	const openShares = [
		await share(db, claim.id, author.id, { email: `new-editor.${tag.toLowerCase()}@example.test` }),
		await share(db, claim.id, author.id, { email: `gone-a.${tag.toLowerCase()}@example.test` }),
		await share(db, claim.id, author.id, { email: `gone-b.${tag.toLowerCase()}@example.test` })
	];
	const editorActor = asUser(editor.id, 'editor');
	const link = async () => {
		const made = await createReviewLink(db, editorActor, claim.id, { label: 'referee' });
		return { id: made.id, token: tokenOf(made.url) };
	};
	// `second` is the valid link's twin for the API re-run: one re-run per link at a time.
	const links = {
		...{ valid: await link(), second: await link() },
		...{ expired: await link(), revoked: await link() }
	};
	await db.models.ReviewLink.update(
		{ expiresAt: new Date(Date.now() - 1000) },
		{ where: { id: links.expired.id } }
	);
	await revokeReviewLink(db, editorActor, links.revoked.id);
	const spareLinks = [await link(), await link(), await link(), await link()];
	const reports = [];
	for (const l of spareLinks.slice(2)) {
		const id = newId();
		const report = { id, reviewLinkId: l.id, claimId: claim.id, recommendation: 'sound' as const };
		await db.models.Report.create({ ...report, comments: 'Sound.', submittedAt: new Date() });
		reports.push(id);
	}
	// The referee's own re-run, as startRefereeCheck records it.
	const rerun = await doneCheck(db, claim.id, dataset.id, author.id);
	const started = { subjectType: 'check', subjectId: rerun, action: 'review.check-started' };
	await audit(db, { actorId: null, ...started, details: { reviewLinkId: links.valid.id } });
	const invitation = async () => {
		const { token, hash } = newSecret();
		const id = newId();
		const row = {
			id,
			groupId: lake,
			email: `invitee.${tag.toLowerCase()}@example.test`,
			role: 'author'
		};
		await db.models.Invitation.create({
			...{ ...row, role: 'author' as const, tokenHash: hash, invitedBy: lead.id },
			expiresAt: new Date(Date.now() + DAY)
		});
		return { id, token };
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
	return {
		...{ tag, lake, ridge, lead, author, spare, other, editor, stranger, admin },
		...{
			claimId: claim.id,
			spareClaimId: spareClaim.id,
			datasetId: dataset.id,
			spareDatasets,
			checks,
			rerun
		},
		...{ certificateId: certificate.id, editorShare, openShares, links, spareLinks, reports },
		...{ invitations, verifyToken, resetToken, mailId, tokens }
	};
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
	passwordHash = await hashPassword(MATRIX_PASSWORD);
	try {
		const kits: Record<string, Kit> = {};
		for (const tag of tags) kits[tag] = await seedKit(database, tag, counts);
		return { dataDir, kits };
	} finally {
		await database.sequelize.close();
		process.env = saved;
	}
}
