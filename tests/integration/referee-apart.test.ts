/**
 * Issue 15 §3, against a real SQLite file, the real check runner and the real mail catcher: a
 * referee's re-run is the referee's (never among the authors' checks, never certified), and a new
 * certificate issued while a review link is open tells the editor and shows on the review page.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { RefereeActor } from '../../src/lib/server/core/actor';
import { startCheckRunner } from '../../src/lib/server/checks/registry';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { getCheck, listChecks } from '../../src/lib/server/checks/checks';
import { getClaim } from '../../src/lib/server/claims/claims';
import { ConflictError } from '../../src/lib/server/core/errors';
import { refereeView, startRefereeCheck } from '../../src/lib/server/review/referee';
import { createReviewLink } from '../../src/lib/server/review/review-links';
import { refereeFor } from '../../src/lib/server/review/review-use';
import { shareClaim } from '../../src/lib/server/review/shares';
import { asUser } from './actors';
import { finishedCheck, type EvidenceWorld } from './evidence-world';
import { mailTo } from './mail-world';
import { reviewWorld, type ReviewWorld } from './review-world';

// Safety limits for bundling and real checks on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

let w: ReviewWorld;
let referee: RefereeActor;
let reRunId: string;

beforeAll(async () => {
	w = await reviewWorld();
	const { database } = w.mail;
	await shareClaim(database, asUser(w.author), w.claimId, {
		email: w.editorEmail,
		journal: 'Journal of Invented Optics',
		manuscript: 'JIO-2026-015'
	});
	const link = await createReviewLink(database, asUser(w.editor, 'editor'), w.claimId);
	const token = new URL(link.url).pathname.split('/').at(-1)!;
	const found = await refereeFor(
		database,
		token,
		{ method: 'GET', path: '/review' },
		{
			address: '192.0.2.15'
		}
	);
	referee = found as RefereeActor;
	reRunId = (await startRefereeCheck(database, referee, { seed: 4242 })).id;
	await (await startCheckRunner(database)).idle();
});
afterAll(async () => w?.close());

describe("a referee's re-run is the referee's", () => {
	it("never appears among the authors' checks (list, claim summary); read by id it is marked", async () => {
		const { database } = w.mail;
		expect((await getCheck(database, referee, reRunId)).status).toBe('done');
		const listed = (await listChecks(database, asUser(w.author), w.claimId)).map((c) => c.id);
		expect(listed).toContain(w.certifiedCheckId);
		expect(listed).not.toContain(reRunId);
		const claim = await getClaim(database, asUser(w.author), w.claimId);
		expect(claim.latestCheck?.id).not.toBe(reRunId);
		expect(await getCheck(database, asUser(w.author), reRunId)).toMatchObject({ byReferee: true });
		expect(await getCheck(database, asUser(w.author), w.certifiedCheckId)).toMatchObject({
			byReferee: false
		});
	});

	it('can never be certified: 409 naming why, and nothing stored', async () => {
		const { database } = w.mail;
		const before = await database.models.Certificate.count();
		const issuing = issueCertificate(database, asUser(w.author), w.claimId, reRunId);
		await expect(issuing).rejects.toBeInstanceOf(ConflictError);
		await expect(issueCertificate(database, asUser(w.author), w.claimId, reRunId)).rejects.toThrow(
			/referee's re-run from a review link/
		);
		expect(await database.models.Certificate.count()).toBe(before);
	});
});

describe('a new certificate while a review link is open', () => {
	it('tells the editor, and the review page names the reviewed certificate and the newer one', async () => {
		const { database } = w.mail;
		const dataset = await database.models.Dataset.findOne({ where: { claimId: w.claimId } });
		const shape = {
			database,
			author: asUser(w.author),
			claimId: w.claimId,
			datasetId: dataset!.get('id') as string
		};
		const check = await finishedCheck(shape as unknown as EvidenceWorld, 77, 400);
		const newer = await issueCertificate(database, asUser(w.author), w.claimId, check.id);
		const notices = (await mailTo(w.mail, w.editorEmail)).filter((m) =>
			m.text.includes('have issued a new\ncertificate')
		);
		expect(notices).toHaveLength(1);
		expect(notices[0].text).toContain(newer.id);
		expect(notices[0].text).toContain(w.certificateId);
		expect(notices[0].text).toContain('JIO-2026-015');
		const view = await refereeView(database, referee);
		expect(view.certificate.id).toBe(w.certificateId);
		expect(view.newerCertificate?.id).toBe(newer.id);
		// The re-runs stay compared with the reviewed certificate's check and its recorded seed.
		expect(view.certified.id).toBe(w.certifiedCheckId);
		expect(view.checks.map((c) => c.id)).toEqual([reRunId]);
	});
});
