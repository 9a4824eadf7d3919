/**
 * Script injection in every text field people type, written through the services into a fresh
 * data folder before the built app starts: group and user names, a claim's title, source notes
 * and manuscript, a withdrawal reason, a share's journal and manuscript, a token's name and a
 * referee's report (filed and released, so its notices are written too).
 */
import { sessionKey } from '../../src/lib/server/accounts/auth';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { RefereeActor, UserActor } from '../../src/lib/server/core/actor';
import { openDatabase } from '../../src/lib/server/db';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { withdrawClaim } from '../../src/lib/server/claims/claim-withdraw';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { newId } from '../../src/lib/server/core/ids';
import { releaseReport, saveReport } from '../../src/lib/server/review/reports';
import { createReviewLink } from '../../src/lib/server/review/review-links';
import { shareClaim } from '../../src/lib/server/review/shares';
import { createToken } from '../../src/lib/server/accounts/tokens';
import { GOOD_CSV } from '../integration/hostile-counts';
import { doneCheck } from './matrix-parts';

/** What each field holds: a script, an attribute break-out and a javascript: link, tagged. */
export const hostile = (field: string) =>
	`${field} <script>alert("${field}")</script>"><img src=x onerror=alert("${field}")> javascript:alert(1)`;

export interface HostileTextWorld {
	dataDir: string;
	sessions: { author: string; editor: string };
	groupId: string;
	claimId: string;
	withdrawnId: string;
	certificateId: string;
	reviewToken: string;
}

// The notices go to the outbox; no service here sends anything itself.

export async function seedHostileText(): Promise<HostileTextWorld> {
	const dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-hostile-text-'));
	const saved = { ...process.env };
	process.env.RANKSEAL_DATA_DIR = dataDir;
	const db = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	try {
		const person = async (key: string, accountRole: 'researcher' | 'editor') => {
			const id = newId();
			const name = hostile(`${key}-name`);
			const row = { id, email: `${key}@example.test`, name, passwordHash: 'unused', accountRole };
			await db.models.User.create({ ...row, emailVerifiedAt: new Date() });
			const session = newId().replaceAll('-', '');
			const expiresAt = new Date(Date.now() + 86_400_000);
			await db.models.Session.create({ id: sessionKey(session), userId: id, expiresAt });
			const actor: UserActor = { kind: 'user', userId: id, accountRole, emailVerified: true };
			return { id, session, actor };
		};
		const author = await person('author', 'researcher');
		const editor = await person('editor', 'editor');
		const groupId = newId();
		await db.models.Group.create({ id: groupId, name: hostile('group').slice(0, 120) });
		const lead = { id: newId(), groupId, userId: author.id, role: 'lead' as const };
		await db.models.Membership.create(lead);
		const fields = {
			...{ title: hostile('title'), sourceDescription: hostile('notes'), dimension: 5 },
			...{ method: 'mub-correlation' as const, bases: [0, 1, 2], claimedSchmidtNumber: 3 },
			manuscriptReference: hostile('manuscript')
		};
		const claim = await createClaim(db, author.actor, fields);
		const bytes = new TextEncoder().encode(GOOD_CSV);
		const dataset = await addDataset(db, author.actor, claim.id, { bytes, originalName: 'a.csv' });
		const checkId = await doneCheck(db, claim.id, dataset.id, author.id);
		const certificate = await issueCertificate(db, author.actor, claim.id, checkId);
		const share = { email: 'editor@example.test', journal: hostile('journal') };
		await shareClaim(db, author.actor, claim.id, {
			...share,
			manuscript: hostile('share')
		});
		const link = await createReviewLink(db, editor.actor, claim.id, { label: hostile('label') });
		const referee: RefereeActor = { kind: 'referee', claimId: claim.id, linkId: link.id };
		const filed = { recommendation: 'sound', comments: hostile('report'), submit: true };
		const report = await saveReport(db, referee, filed);
		await releaseReport(db, editor.actor, report.id);
		await createToken(db, author.actor, { name: hostile('token').slice(0, 80) });
		const withdrawn = await createClaim(db, author.actor, { ...fields, title: hostile('gone') });
		await withdrawClaim(db, author.actor, withdrawn.id, hostile('reason'));
		return {
			...{ dataDir, groupId, claimId: claim.id, withdrawnId: withdrawn.id },
			sessions: { author: author.session, editor: editor.session },
			certificateId: certificate.id,
			reviewToken: link.url.slice(link.url.lastIndexOf('/') + 1)
		};
	} finally {
		await db.sequelize.close();
		process.env = saved;
	}
}
