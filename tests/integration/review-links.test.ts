/**
 * Sharing and review links against a real SQLite file, the real mail catcher and the real check
 * runner: which tokens are refused, what a valid link reaches, and what it may write.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { ZodError } from 'zod';
import type { Actor, RefereeActor } from '../../src/lib/server/core/actor';
import { requireClaim } from '../../src/lib/server/access/permissions';
import { getCheck, listChecks } from '../../src/lib/server/checks/checks';
import { getClaim } from '../../src/lib/server/claims/claims';
import { addDataset, listDatasets } from '../../src/lib/server/datasets/datasets';
import { editorHome } from '../../src/lib/server/review/editor-home';
import { ConflictError, ForbiddenError, NotFoundError } from '../../src/lib/server/core/errors';
import { hashSecret, newId, newSecret } from '../../src/lib/server/core/ids';
import {
	refereeBundle,
	refereeCheck,
	refereeView,
	startRefereeCheck,
	type RefereeCheck
} from '../../src/lib/server/review/referee';
import { releaseReport, releasedReports, saveReport } from '../../src/lib/server/review/reports';
import {
	createReviewLink,
	resolveReviewToken,
	revokeReviewLink
} from '../../src/lib/server/review/review-links';
import { shareClaim, withdrawShare } from '../../src/lib/server/review/shares';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { asUser } from './actors';
import { bytesOf, countsCsv } from './backend-fixtures';
import { linkToken, mailTo } from './mail-world';
import { reviewWorld, type ReviewWorld } from './review-world';

// Safety limits for bundling and a real check on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

let w: ReviewWorld;
let author: Actor, editor: Actor;
const use = { method: 'GET', path: '/api/v1/review/test' };
const tokenOf = (url: string) => new URL(url).pathname.split('/').at(-1)!;

beforeAll(async () => {
	w = await reviewWorld();
	author = asUser(w.author);
	editor = asUser(w.editor, 'editor');
	await shareClaim(w.mail.database, author, w.claimId, {
		email: w.editorEmail,
		journal: 'Journal of Invented Optics',
		manuscript: 'JIO-2026-001'
	});
});
afterAll(async () => w.close());

/** Waits for the re-run to reach a final state (bounded by count, not by time). */
async function finished(referee: Actor, id: string): Promise<RefereeCheck> {
	for (let i = 0; i < 20_000; i++) {
		const check = await refereeCheck(w.mail.database, referee, id);
		if (check.status === 'done' || check.status === 'failed') return check;
		await new Promise((wake) => setTimeout(wake, 20));
	}
	throw new Error(`re-run ${id} did not finish`);
}

async function newLink(input = {}) {
	const link = await createReviewLink(w.mail.database, editor, w.claimId, input);
	const token = tokenOf(link.url);
	return { ...link, token, referee: (await resolveReviewToken(w.mail.database, token, use))! };
}

describe('the SHA-256 kept for tokens', () => {
	it('is SHA-256 (FIPS 180-2, appendix B.1: "abc")', () => {
		expect(hashSecret('abc')).toBe(
			'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad'
		);
	});
});

describe('sharing with an editor', () => {
	it('sends the editor one notice whose only link is the share link', async () => {
		const [notice] = await mailTo(w.mail, w.editorEmail);
		expect(notice.subject).toMatch(/shared with you/);
		const token = await linkToken(w.mail, w.editorEmail, '/shared/');
		expect(token).toMatch(/^shr_/);
		expect(notice.text.match(/https?:\/\//g)).toHaveLength(1);
		expect(notice.html).toContain(`/shared/${token}`);
	});

	it('lets only the editor it was shared with see the claim; others get 404', async () => {
		expect((await getClaim(w.mail.database, editor, w.claimId)).id).toBe(w.claimId);
		await expect(
			getClaim(w.mail.database, asUser(w.otherEditor, 'editor'), w.claimId)
		).rejects.toThrow(NotFoundError);
		await expect(getClaim(w.mail.database, editor, w.otherClaimId)).rejects.toThrow(NotFoundError);
		const home = await editorHome(w.mail.database, editor);
		expect(home.map((h) => h.claim.id)).toEqual([w.claimId]);
		expect(home[0].certificates.map((c) => c.id)).toEqual([w.certificateId]);
	});

	it('refuses a claim without a certificate, and callers outside the group', async () => {
		const { database } = w.mail;
		const input = { email: 'x@example.test', journal: 'J', manuscript: 'M' };
		await expect(shareClaim(database, asUser(w.outsider), w.claimId, input)).rejects.toThrow(
			NotFoundError
		);
		await expect(shareClaim(database, editor, w.claimId, input)).rejects.toThrow(ForbiddenError);
		await expect(
			shareClaim(database, author, w.claimId, { ...input, email: 'nope' })
		).rejects.toThrow(ZodError);
		const group = (await database.models.Claim.findByPk(w.claimId))!.get('groupId') as string;
		const draft = await database.models.Claim.create({
			...{ id: newId(), groupId: group, createdBy: w.author, title: 'Uncertified' },
			...{ sourceDescription: 's', dimension: 5, method: 'mub-correlation', bases: [0, 1] },
			claimedSchmidtNumber: 3
		});
		await expect(shareClaim(database, author, draft.get('id') as string, input)).rejects.toThrow(
			ConflictError
		);
	});

	it('keeps user words from becoming links in the notice (journal named like an address)', async () => {
		const { database } = w.mail;
		await shareClaim(database, author, w.claimId, {
			email: 'words@example.test',
			journal: 'evil.example/<b>x</b>',
			manuscript: 'http://evil.example'
		});
		const [notice] = await mailTo(w.mail, 'words@example.test');
		expect(notice.text).not.toContain('evil.example');
		expect(notice.text.match(/https?:\/\//g)).toHaveLength(1);
		expect(notice.html).not.toContain('<b>');
		expect(notice.html!.match(/<a /g)).toHaveLength(1);
	});
});

describe('review links', () => {
	it('carry 256 random bits, store only their SHA-256, and default to 30 days', async () => {
		const before = Date.now();
		const link = await newLink();
		expect(link.token).toMatch(/^rvw_[\w-]{43}$/);
		const row = (await w.mail.database.models.ReviewLink.findByPk(link.id))!.get({ plain: true });
		expect(row.tokenHash).toBe(sha256Hex(link.token));
		const days = (new Date(link.expiresAt).getTime() - before) / 86_400_000;
		expect(Math.round(days)).toBe(30);
		const file = readFileSync(path.join(w.mail.folder, 'rankseal.sqlite'));
		expect(file.includes(Buffer.from(link.token))).toBe(false);
	});

	it('last at most 180 days', async () => {
		await expect(
			createReviewLink(w.mail.database, editor, w.claimId, { expiresInDays: 181 })
		).rejects.toThrow(ZodError);
		const longest = await createReviewLink(w.mail.database, editor, w.claimId, {
			expiresInDays: 180
		});
		expect(longest.expiresAt > new Date(Date.now() + 179 * 86_400_000).toISOString()).toBe(true);
	});

	it('refuse expired, revoked, tampered, guessed and malformed tokens, and log every use', async () => {
		const { database } = w.mail;
		const expired = await newLink();
		await database.models.ReviewLink.update(
			{ expiresAt: new Date(Date.now() - 1000) },
			{ where: { id: expired.id } }
		);
		const revoked = await newLink();
		await revokeReviewLink(database, editor, revoked.id);
		const valid = await newLink();
		const last = valid.token.at(-1) === 'A' ? 'B' : 'A';
		const tampered = valid.token.slice(0, -1) + last;
		const guessed = newSecret('rvw_').token;
		for (const token of [expired.token, revoked.token, tampered, guessed, 'rvw_', '../x', ''])
			expect(await resolveReviewToken(database, token, use)).toBeNull();
		expect(await resolveReviewToken(database, valid.token, use)).toEqual(valid.referee);
		const logged = await database.models.AuditEvent.findAll({
			where: { action: 'review-link.used', subjectId: [expired.id, revoked.id, valid.id] }
		});
		expect(logged.map((e) => (e.get('details') as { state: string }).state).sort()).toEqual(
			['active', 'active', 'active', 'active', 'expired', 'revoked'].sort()
		);
	});

	it('are made and revoked only by the editor the claim is shared with', async () => {
		const { database } = w.mail;
		await expect(createReviewLink(database, author, w.claimId)).rejects.toThrow(ForbiddenError);
		await expect(
			createReviewLink(database, asUser(w.otherEditor, 'editor'), w.claimId)
		).rejects.toThrow(NotFoundError);
		const link = await newLink();
		await expect(revokeReviewLink(database, author, link.id)).rejects.toThrow(ForbiddenError);
		await expect(
			revokeReviewLink(database, asUser(w.otherEditor, 'editor'), link.id)
		).rejects.toThrow(NotFoundError);
	});
});

describe('a referee with a valid link', () => {
	let link: Awaited<ReturnType<typeof newLink>>;
	let referee: RefereeActor;
	beforeAll(async () => {
		link = await newLink({ label: 'Dr Hidden' });
		referee = link.referee;
	});

	it('sees the claim, its certificate, the certified check and the counts tables', async () => {
		const view = await refereeView(w.mail.database, referee);
		expect(view.claim.id).toBe(w.claimId);
		expect(view.certificate.id).toBe(w.certificateId);
		expect(view.certified.id).toBe(w.certifiedCheckId);
		expect(view.tables.map((t) => t.basis)).toEqual([0, 1, 2]);
		const bundle = await refereeBundle(w.mail.database, referee);
		expect(bundle.bytes.subarray(0, 2).toString()).toBe('PK');
	});

	it('reaches no other claim, and writes nothing beyond its own check and report', async () => {
		const { database } = w.mail;
		const count = async () => {
			const { Claim, Dataset, Certificate, Share, ReviewLink, Membership, ApiToken } =
				database.models;
			return [
				Claim.count(),
				Dataset.count(),
				Certificate.count(),
				Share.count(),
				ReviewLink.count(),
				Membership.count(),
				ApiToken.count()
			];
		};
		const before = await Promise.all(await count());
		await expect(getClaim(database, referee, w.otherClaimId)).rejects.toThrow(NotFoundError);
		await expect(requireClaim(database, referee, w.otherClaimId, 'read')).rejects.toThrow(
			NotFoundError
		);
		await expect(listChecks(database, referee, w.otherClaimId)).rejects.toThrow(NotFoundError);
		await expect(listDatasets(database, referee, w.otherClaimId)).rejects.toThrow(NotFoundError);
		await expect(refereeCheck(database, referee, w.certifiedCheckId)).rejects.toThrow(
			NotFoundError
		);
		const upload = { bytes: bytesOf(countsCsv(5, [0, 1], 1000, 3)), originalName: 'x.csv' };
		await expect(addDataset(database, referee, w.claimId, upload)).rejects.toThrow(ForbiddenError);
		const input = { email: 'x@example.test', journal: 'J', manuscript: 'M' };
		await expect(shareClaim(database, referee, w.claimId, input)).rejects.toThrow();
		await expect(createReviewLink(database, referee, w.claimId)).rejects.toThrow();
		await expect(revokeReviewLink(database, referee, link.id)).rejects.toThrow();
		await expect(editorHome(database, referee)).rejects.toThrow();
		const shareId = (await database.models.Share.findOne())!.get('id') as string;
		await expect(withdrawShare(database, referee, shareId)).rejects.toThrow();
		expect(await Promise.all(await count())).toEqual(before);
	});

	it('re-runs the certified check: the recorded seed gives the certificate’s numbers exactly', async () => {
		const { database } = w.mail;
		const started = await startRefereeCheck(database, referee, {});
		expect(['queued', 'running']).toContain(started.status);
		const done = await finished(referee, started.id);
		expect(done.status).toBe('done');
		const certified = await getCheck(database, asUser(w.author), w.certifiedCheckId);
		expect(done.seed).toBe(certified.seed);
		expect(done.result).toEqual(certified.result);
		expect(done.comparison).toMatchObject({
			sameSeed: true,
			identical: true,
			firstDifference: null
		});
	});

	it('re-runs with a fresh seed and says whether the bound agrees within the stated error', async () => {
		const started = await startRefereeCheck(w.mail.database, referee, { seed: 424242 });
		const done = await finished(referee, started.id);
		expect(done.seed).toBe(424242);
		expect(done.comparison.sameSeed).toBe(false);
		expect(done.comparison.identical).toBe(false);
		expect(typeof done.comparison.withinError).toBe('boolean');
		// The point value does not depend on the seed; only the resampled bound does.
		const certified = await getCheck(w.mail.database, referee, w.certifiedCheckId);
		expect(done.result!.statistic.value).toBe(certified.result!.statistic.value);
	});

	it('files one report, editable until submitted; the editor is told and releases it', async () => {
		const { database } = w.mail;
		await expect(
			saveReport(database, referee, { recommendation: 'great', comments: '' })
		).rejects.toThrow(ZodError);
		const draft = await saveReport(database, referee, {
			recommendation: 'sound',
			comments: 'first',
			submit: false
		});
		expect(draft.state).toBe('draft');
		expect(await releasedReports(database, author, w.claimId)).toEqual([]);
		await expect(releaseReport(database, editor, draft.id)).rejects.toThrow(ConflictError);
		const filed = await saveReport(database, referee, {
			recommendation: 'needs-revision',
			comments: 'second'
		});
		expect(filed).toMatchObject({ id: draft.id, state: 'submitted', comments: 'second' });
		await expect(
			saveReport(database, referee, { recommendation: 'sound', comments: 'third' })
		).rejects.toThrow(ConflictError);
		const toEditor = await mailTo(w.mail, w.editorEmail);
		expect(toEditor.at(-1)!.subject).toMatch(/filed a report/);
		expect(await releasedReports(database, author, w.claimId)).toEqual([]);
		await expect(
			releaseReport(database, asUser(w.otherEditor, 'editor'), draft.id)
		).rejects.toThrow(NotFoundError);
		await expect(releaseReport(database, author, draft.id)).rejects.toThrow();
		await releaseReport(database, editor, draft.id);
		const released = await releasedReports(database, author, w.claimId);
		expect(released.map((r) => r.comments)).toEqual(['second']);
		expect(JSON.stringify(released)).not.toContain('Dr Hidden');
		const authorEmail = (await database.models.User.findByPk(w.author))!.get('email') as string;
		expect((await mailTo(w.mail, authorEmail)).at(-1)!.subject).toMatch(/released/);
	});

	it('loses everything when the author withdraws the share', async () => {
		const { database } = w.mail;
		const shareId = (await database.models.Share.findOne({
			where: { editorEmail: w.editorEmail }
		}))!.get('id') as string;
		await withdrawShare(database, author, shareId);
		expect(await resolveReviewToken(database, link.token, use)).toBeNull();
		await expect(getClaim(database, editor, w.claimId)).rejects.toThrow(NotFoundError);
		expect(await editorHome(database, editor)).toEqual([]);
	});
});
