/**
 * The demo seed: once, complete (people, group, claims, datasets, checks, token, a certificate
 * for each supported claim, and the review scene: a shared claim, a review link, a filed report,
 * the editor's token), and idempotent.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { signIn } from '../../src/lib/server/accounts/accounts';
import { bundleCheckWorker } from '../../src/lib/server/checks/locate';
import { stopCheckRunner } from '../../src/lib/server/checks/registry';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import {
	certificateFile,
	listCertificates
} from '../../src/lib/server/certificates/certificate-reads';
import { listChecks } from '../../src/lib/server/checks/checks';
import { listClaims } from '../../src/lib/server/claims/claims';
import { authenticate } from '../../src/lib/server/accounts/tokens';
import { demoTokenFile, seedDemo } from '../../src/lib/server/demo/seed';
import { DEMO_CLAIMS, DEMO_PEOPLE } from '../../src/lib/server/demo/scenario';
import { demoEditorTokenFile, demoReviewLinkFile } from '../../src/lib/server/demo/review-seed';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { refereeView } from '../../src/lib/server/review/referee';
import { resolveReviewToken } from '../../src/lib/server/review/review-links';
import { asUser } from './actors';
import { mailTo, mailWorld, type MailWorld } from './mail-world';

// Safety limits for bundling and the demo's checks on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

let ctx: MailWorld;
let workerFolder: string;

beforeAll(async () => {
	ctx = await mailWorld();
	workerFolder = mkdtempSync(path.join(tmpdir(), 'rankseal-demo-worker-'));
	process.env.RANKSEAL_DATA_DIR = ctx.folder;
	process.env.RANKSEAL_CHECK_WORKER = await bundleCheckWorker(path.join(workerFolder, 'w.mjs'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(workerFolder, 'verify.mjs'));
});
afterAll(async () => {
	await stopCheckRunner(ctx.database);
	await ctx.close();
	rmSync(workerFolder, { recursive: true, force: true });
});

describe('demo scenario', () => {
	it('seeds people with the documented passwords, the claims with counts and checks, and a token', async () => {
		expect(await seedDemo(ctx.database)).toBe('seeded');
		for (const person of DEMO_PEOPLE)
			expect(await signIn(ctx.database, person.email, person.password)).not.toBeNull();
		const author = (await signIn(ctx.database, DEMO_PEOPLE[1].email, DEMO_PEOPLE[1].password))!
			.userId;
		const { items } = await listClaims(ctx.database, asUser(author), {});
		expect(items).toHaveLength(DEMO_CLAIMS.length);
		expect(new Set(items.map((c) => c.method))).toEqual(
			new Set(['mub-correlation', 'steering-2mub', 'fidelity-two-basis'])
		);
		const verdicts: string[] = [];
		// seedDemo returns once the checks have run and the certificates are issued.
		for (const claim of items) {
			const checks = await listChecks(ctx.database, asUser(author), claim.id);
			expect(checks.map((c) => c.status)).toEqual(['done']);
			const verdict = checks[0].result!.claim!.verdict;
			verdicts.push(verdict);
			const certificates = await listCertificates(ctx.database, asUser(author), claim.id);
			expect(certificates.map((c) => c.status)).toEqual(verdict === 'supported' ? ['valid'] : []);
			for (const certificate of certificates) {
				const bundle = await certificateFile(
					ctx.database,
					asUser(author),
					certificate.id,
					'bundle'
				);
				expect(verifyEvidence(readZip(bundle.bytes))).toMatchObject({ valid: true });
				const pdf = await certificateFile(ctx.database, asUser(author), certificate.id, 'pdf');
				// Every PDF starts with "%PDF-" (ISO 32000-1 §7.5.2).
				expect(new TextDecoder().decode(pdf.bytes.subarray(0, 5))).toBe('%PDF-');
			}
		}
		expect(verdicts).toContain('supported');
		expect(verdicts).toContain('not supported');
		const token = readFileSync(demoTokenFile(), 'utf8').trim();
		const owner = await ctx.database.models.User.findOne({
			where: { email: DEMO_PEOPLE[1].email }
		});
		expect((await authenticate(ctx.database, token))?.userId).toBe(owner?.get('id'));
	});

	it('shares the first claim with the demo editor, with a working review link and a filed report', async () => {
		const url = readFileSync(demoReviewLinkFile(), 'utf8').trim();
		const token = new URL(url).pathname.split('/').at(-1)!;
		const use = { method: 'GET', path: '/test' };
		const referee = (await resolveReviewToken(ctx.database, token, use))!;
		const view = await refereeView(ctx.database, referee);
		expect(view.claim.title).toBe(DEMO_CLAIMS[0].title);
		expect(view.report).toBeNull();
		const reports = await ctx.database.models.Report.findAll();
		expect(reports.map((r) => r.get('submittedAt') !== null)).toEqual([true]);
		const editor = DEMO_PEOPLE.find((p) => p.key === 'editor')!;
		const token2 = readFileSync(demoEditorTokenFile(), 'utf8').trim();
		expect((await authenticate(ctx.database, token2))?.userId).toBe(
			(await signIn(ctx.database, editor.email, editor.password))!.userId
		);
		expect((await mailTo(ctx, editor.email)).map((m) => m.subject).join('|')).toMatch(
			/shared with you.*filed a report/
		);
	});

	it('changes nothing when run again, and writes a fresh token when the file is gone', async () => {
		const count = await ctx.database.models.Claim.count();
		const certificates = await ctx.database.models.Certificate.count();
		expect(await seedDemo(ctx.database)).toBe('present');
		expect(await ctx.database.models.Claim.count()).toBe(count);
		expect(await ctx.database.models.Certificate.count()).toBe(certificates);
		rmSync(demoTokenFile());
		expect(await seedDemo(ctx.database)).toBe('present');
		expect(existsSync(demoTokenFile())).toBe(true);
		expect(
			await authenticate(ctx.database, readFileSync(demoTokenFile(), 'utf8').trim())
		).not.toBeNull();
	});
});
