/**
 * Odd text never breaks a flow (issue 16 part 4). A property test (fast-check) types text a
 * person could paste into every field of the claim, group and share flows: line and paragraph
 * separators, carriage returns, bidi controls, combining marks, emoji, long runs, broken
 * surrogates, NUL. Each value is either refused with a 4xx naming its field, or carried through
 * sign-up, the group, its invitation, the claim, an upload, issuing a certificate (its PDF read
 * back with pdftotext, its bundle checked), sharing with an editor, their review link, a
 * referee's report and its release, withdrawing, the archive export and the delivery of every
 * letter, with no 5xx and no other exception. Real SQLite file, real mail catcher.
 * The bidi controls refused are those of "Trojan Source" (CVE-2021-42574).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { problemOf, type Problem } from '../../src/lib/server/http/problems';
import { signUp } from '../../src/lib/server/accounts/account-requests';
import { groupArchive } from '../../src/lib/server/claims/archive';
import {
	archiveCsv,
	archiveFilename,
	archiveJson
} from '../../src/lib/server/claims/archive-export';
import { certificateFile, checkBundle } from '../../src/lib/server/certificates/certificate-reads';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { withdrawClaim } from '../../src/lib/server/claims/claim-withdraw';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { createGroup } from '../../src/lib/server/accounts/groups';
import { inviteMember } from '../../src/lib/server/accounts/invitations';
import { shareClaim } from '../../src/lib/server/review/shares';
import { releaseReport, saveReport } from '../../src/lib/server/review/reports';
import { createReviewLink } from '../../src/lib/server/review/review-links';
import { createToken } from '../../src/lib/server/accounts/tokens';
import { deliverDue } from '../../src/lib/server/mail/mail-sender';
import { textProblem } from '../../src/lib/text-rules';
import { doneCheck } from '../e2e/matrix-parts';
import { asUser } from './actors';
import { addUser } from './backend-fixtures';
import { GOOD_CSV } from './hostile-counts';
import { mailWorld, type MailWorld } from './mail-world';

const scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-odd-text-'));
let world: MailWorld;
let lead: ReturnType<typeof asUser>;
let run = 0;

beforeAll(async () => {
	world = await mailWorld();
	const id = await addUser(world.database, 'Odd Text Lead');
	lead = asUser(id);
});
afterAll(async () => {
	await world?.close();
	rmSync(scratch, { recursive: true, force: true });
});

/** Pieces a person can paste, each one a known way text has broken something. */
const PIECES = [
	...['\r', '\n', '\r\n', '\u2028', '\u2029', '\u0085', '\t', '\u000b', '\u000c'],
	...['\u202e', '\u2066', '\u2069', '\u200f', '\u061c', '\ufeff', '\u200b', '\u00ad'],
	...['e\u0301', '\u0301', 'Z\u0351\u0352\u0353', '👩‍🔬', '🏳️‍🌈', '日本語', 'ﷺ', 'Ångström'],
	...['"', "'", '<b>', '&amp;', '\\', '{{title}}', '$&', '$1', '=1+1', '%s', '\u0000', '\u001b'],
	...['\ud800', '\udc00', ' ', 'a', 'Halvorsen Lake']
];
const odd = fc.oneof(
	fc.array(fc.constantFrom(...PIECES), { minLength: 1, maxLength: 10 }).map((p) => p.join('')),
	fc.string({ unit: 'grapheme', minLength: 1, maxLength: 30 }),
	fc.string({ unit: 'binary', minLength: 1, maxLength: 30 }),
	fc.constantFrom('x'.repeat(10_000), 'é'.repeat(4_999) + '\u2028', '\u2028'.repeat(300))
);

interface Texts {
	name: string;
	group: string;
	title: string;
	source: string;
	manuscript: string;
	fileName: string;
	journal: string;
	shareManuscript: string;
	token: string;
	reason: string;
	label: string;
	comments: string;
}
const texts: fc.Arbitrary<Texts> = fc.record({
	...{ name: odd, group: odd, title: odd, source: odd, manuscript: odd, fileName: odd },
	...{ journal: odd, shareManuscript: odd, token: odd, reason: odd, label: odd, comments: odd }
});

/** The step's value, or the 4xx it was refused with; anything else fails the property. */
async function step<T>(work: () => Promise<T>): Promise<{ value: T } | { problem: Problem }> {
	try {
		return { value: await work() };
	} catch (thrown) {
		const problem = problemOf(thrown);
		if (!problem || problem.status >= 500) throw thrown;
		expect(problem.status).toBeLessThan(500);
		expect(problem.message.length).toBeGreaterThan(0);
		return { problem };
	}
}

const valueOr = <T>(outcome: { value: T } | { problem: Problem }, fallback: T): T =>
	'value' in outcome ? outcome.value : fallback;

/** Text in the PDF, as poppler reads it back. */
function pdfText(bytes: Uint8Array): string {
	const file = path.join(scratch, `c${run}.pdf`);
	writeFileSync(file, bytes);
	return execFileSync('pdftotext', ['-enc', 'UTF-8', file, '-']).toString('utf8');
}

/** An editor account with the address a share will name, so the share binds to it. */
async function editorNamed(email: string) {
	const id = await addUser(world.database, `Editor ${run}`);
	await world.database.models.User.update({ email, accountRole: 'editor' }, { where: { id } });
	return asUser(id, 'editor');
}

/** The editor's review link (its label), the referee's report (its comments), its release. */
async function review(editor: ReturnType<typeof asUser>, claimId: string, t: Texts) {
	const { database: db } = world;
	const link = await step(() => createReviewLink(db, editor, claimId, { label: t.label }));
	const made = 'value' in link ? link.value : await createReviewLink(db, editor, claimId, {});
	const referee = { kind: 'referee' as const, claimId, linkId: made.id };
	const input = { recommendation: 'sound', comments: t.comments, submit: true };
	const report = await step(() => saveReport(db, referee, input));
	if ('value' in report) await releaseReport(db, editor, report.value.id);
}

async function flow(t: Texts): Promise<void> {
	const { database: db, mailer } = world;
	run++;
	const password = 'odd text passphrase';
	await step(() => signUp(db, { email: `p${run}@odd.test`, name: t.name, password }));
	const group = await step(() => createGroup(db, lead, t.group));
	const groupId = valueOr(group, null)?.id ?? (await createGroup(db, lead, `Group ${run}`)).id;
	await inviteMember(db, lead, groupId, { email: `i${run}@odd.test`, role: 'author' });
	const fields = { groupId, dimension: 5, method: 'mub-correlation' as const, bases: [0, 1, 2] };
	const claimInput = { ...fields, claimedSchmidtNumber: 3, title: t.title };
	const made = await step(() =>
		createClaim(db, lead, {
			...claimInput,
			sourceDescription: t.source,
			manuscriptReference: t.manuscript
		})
	);
	const claim =
		valueOr(made, null) ??
		(await createClaim(db, lead, { ...claimInput, title: `Claim ${run}`, sourceDescription: 's' }));
	const bytes = new TextEncoder().encode(GOOD_CSV);
	const dataset = await addDataset(db, lead, claim.id, { bytes, originalName: t.fileName });
	const checkId = await doneCheck(db, claim.id, dataset.id, lead.userId);
	const certificate = await issueCertificate(db, lead, claim.id, checkId);
	const pdf = await certificateFile(db, lead, certificate.id, 'pdf');
	expect(pdfText(pdf.bytes)).toContain('Rankseal');
	// The bundle holds the claim's text in its signed manifest; it still checks out.
	const bundle = await certificateFile(db, lead, certificate.id, 'bundle');
	expect((await checkBundle(db, Buffer.from(bundle.bytes))).report).toMatchObject({ valid: true });
	const editorEmail = `editor${run}@odd.test`;
	const editor = await editorNamed(editorEmail);
	const share = { email: editorEmail, journal: t.journal, manuscript: t.shareManuscript };
	const shared = await step(() => shareClaim(db, lead, claim.id, share));
	if ('value' in shared) await review(editor, claim.id, t);
	await step(() => createToken(db, lead, { name: t.token }));
	await step(() => withdrawClaim(db, lead, claim.id, t.reason));
	const archive = await groupArchive(db, lead, { group: groupId });
	for (const text of [archiveCsv(archive), archiveJson(archive), archiveFilename(archive, 'csv')])
		expect(text.length).toBeGreaterThan(0);
	await deliverDue(db, mailer);
	expect(await db.models.OutboxMail.count({ where: { status: 'failed' } })).toBe(0);
	// Refused exactly when the rule says so: a one-line field with a break is never carried.
	if ('value' in made) expect(textProblem(made.value.title, 'line')).toBeNull();
	else if (made.problem.field === 'title') expect(made.problem.message).toMatch(/title/i);
}

describe('odd text in every field', () => {
	it('is refused with a 4xx naming the field, or carried through every flow', async () => {
		const plain: Texts = {
			...{ name: 'Ines Park', group: 'Halvorsen Lake Photonics', title: 'Time-bin pairs' },
			...{ source: 'SPDC', manuscript: 'HLP-1', fileName: 'counts.csv', journal: 'J. Opt.' },
			...{ shareManuscript: 'JO-1', token: 'laptop', reason: 'A better analysis exists.' },
			...{ label: 'Referee 2', comments: 'Sound.\nSee the second basis.' }
		};
		// The breaks the probe found, always tried first: CR and U+2028 in a title, CR/LF in a group.
		const examples: [Texts][] = [
			[{ ...plain, title: 'Pairs\r at 1550 nm' }],
			[{ ...plain, title: 'Pairs\u2028at 1550 nm', reason: 'Line one\u2029line two' }],
			[{ ...plain, group: 'Halvorsen\r\nLake', fileName: 'données 😀\u2028.csv' }]
		];
		await fc.assert(fc.asyncProperty(texts, flow), { numRuns: 12, examples, endOnFailure: true });
	}, 600_000);
});
