/**
 * A referee re-runs a certified fidelity-target check from a review link (witnesses.md §4.3′), for
 * a declared λ and for λ fitted on a separate calibration run (§9): a real SQLite file, the real mail
 * catcher, the bundled check worker and verifier. The bound uses exact limits and draws no random
 * numbers, so any seed must give the certificate's result bit for bit, and the comparison the
 * referee reads must say that, not speak of resampling noise. Expected values: the certified check
 * itself and the engine called directly (tests/unit/fidelity-target.test.ts ties the engine to
 * §4.3′'s isotropic example).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { render } from 'svelte/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { parseCounts } from '../../src/lib/certify';
import { seedless } from '../../src/lib/certify/seedless';
import { fitCaution, fitTarget, type TargetResult } from '../../src/lib/certify/fidelity-target';
import { sha256Hex } from '../../src/lib/evidence/hash';
import type { RefereeActor } from '../../src/lib/server/core/actor';
import { ConflictError } from '../../src/lib/server/core/errors';
import { bundleCheckWorker } from '../../src/lib/server/checks/locate';
import { startCheckRunner, stopCheckRunner } from '../../src/lib/server/checks/registry';
import {
	getCheck,
	listChecks,
	startCheck,
	type CheckView
} from '../../src/lib/server/checks/checks';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { createClaim, getClaim } from '../../src/lib/server/claims/claims';
import { addTargetRun } from '../../src/lib/server/claims/target-run';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import {
	refereeCheck,
	refereeView,
	startRefereeCheck,
	type RefereeCheck
} from '../../src/lib/server/review/referee';
import { createReviewLink } from '../../src/lib/server/review/review-links';
import { refereeFor } from '../../src/lib/server/review/review-use';
import { shareClaim } from '../../src/lib/server/review/shares';
import ReRuns from '../../src/routes/review/[token]/ReRuns.svelte';
import ReviewPage from '../../src/routes/review/[token]/+page.svelte';
import { TARGET_EXAMPLE, targetCountsCsv } from '../target-counts';
import { asUser } from './actors';
import { addEditor, addGroup, addUser, bytesOf, claimFields } from './backend-fixtures';
import { mailWorld, type MailWorld } from './mail-world';

// Safety limits for bundling and checks on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

const { d, raw, v } = TARGET_EXAMPLE;
const counts = targetCountsCsv(raw, v, 1e6);
/** Counts the authors add after the certificate: a re-run must not pick them up. */
const laterCounts = targetCountsCsv(raw, 0.7, 4e5);
/** The calibration run: the computational table (basis 0) of the same source, a shorter run. */
const run = targetCountsCsv(raw, v, 2e5)
	.split('\n')
	.filter((row) => !row.startsWith('1,'))
	.join('\n');

let world: MailWorld;
let tools: string;
let author: string;
let editor: string;
let editorEmail: string;

const idle = async () => (await startCheckRunner(world.database)).idle();

interface Certified {
	claimId: string;
	check: CheckView;
	referee: RefereeActor;
}

/** A fidelity-target claim with its counts, checked, certified, shared and opened by a referee. */
async function certifiedClaim(kind: 'declared' | 'calibration-run'): Promise<Certified> {
	const { database } = world;
	const claim = await createClaim(database, asUser(author), {
		...claimFields,
		dimension: d,
		method: 'fidelity-target',
		claimedSchmidtNumber: 2,
		...(kind === 'declared' ? { target: raw } : { targetFrom: 'calibration-run' })
	} as Parameters<typeof createClaim>[2]);
	if (kind === 'calibration-run')
		await addTargetRun(database, asUser(author), claim.id, {
			bytes: bytesOf(run),
			originalName: 'run-0412.csv'
		});
	await addDataset(database, asUser(author), claim.id, {
		bytes: bytesOf(counts),
		originalName: 'pixels-target.csv'
	});
	const started = await startCheck(database, asUser(author), claim.id, { confidence: 0.99 });
	await idle();
	const check = await getCheck(database, asUser(author), started.id);
	await issueCertificate(database, asUser(author), claim.id, check.id);
	await shareClaim(database, asUser(author), claim.id, {
		email: editorEmail,
		journal: 'Journal of Invented Optics',
		manuscript: `JIO-2026-${kind}`
	});
	const link = await createReviewLink(database, asUser(editor, 'editor'), claim.id);
	const token = new URL(link.url).pathname.split('/').at(-1)!;
	const use = { method: 'GET', path: '/review' };
	const referee = (await refereeFor(database, token, use, {
		address: '192.0.2.30'
	})) as RefereeActor;
	return { claimId: claim.id, check, referee };
}

async function reRun(c: Certified, seed?: number): Promise<RefereeCheck> {
	const started = await startRefereeCheck(world.database, c.referee, seed ? { seed } : {});
	await idle();
	return refereeCheck(world.database, c.referee, started.id);
}

/** The review page's list of re-runs as the server renders it, with the page's own props. */
async function rendered(c: Certified, rerun: RefereeCheck): Promise<string> {
	const view = await refereeView(world.database, c.referee);
	const certifiedLower = view.certified.result?.statistic?.lower ?? null;
	const props = {
		recordedSeed: view.certified.seed,
		certifiedLower,
		seedless: seedless(view.certified.result),
		checks: [rerun]
	};
	const { body } = render(ReRuns, { props: { ...props, cancellable: [], form: null } });
	return body.replace(/<!--[^]*?-->/g, '').replace(/\s+/g, ' ');
}

/** The whole review page as the server renders it from its load's data (a crash is a 500). */
async function reviewPage(c: Certified): Promise<string> {
	const view = await refereeView(world.database, c.referee);
	const data = { ...view, cancellable: [], token: 'rvw_test' };
	const { body } = render(ReviewPage, { props: { data, form: null } as never });
	return body.replace(/<!--[^]*?-->/g, '').replace(/\s+/g, ' ');
}

beforeAll(async () => {
	world = await mailWorld();
	tools = mkdtempSync(path.join(tmpdir(), 'rankseal-target-referee-'));
	process.env.RANKSEAL_DATA_DIR = world.folder;
	process.env.RANKSEAL_CHECK_WORKERS = '1';
	process.env.RANKSEAL_CHECK_WORKER = await bundleCheckWorker(path.join(tools, 'worker.mjs'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(tools, 'verify.mjs'));
	const lake = await addGroup(world.database, 'Halvorsen Lake Photonics');
	author = await addUser(world.database, 'Ada Lind', [[lake, 'author']]);
	({ id: editor, email: editorEmail } = await addEditor(world.database, 'Eda Kern'));
});
afterAll(async () => {
	await stopCheckRunner(world.database);
	await world.close();
	rmSync(tools, { recursive: true, force: true });
});

describe.each(['declared', 'calibration-run'] as const)(
	'a referee re-runs a fidelity-target claim whose λ is %s',
	(kind) => {
		let c: Certified;
		let certified: TargetResult;

		beforeAll(async () => {
			c = await certifiedClaim(kind);
			certified = c.check.result as unknown as TargetResult;
			// Counts added after the certificate: the re-run is of the certified file, not the newest.
			await addDataset(world.database, asUser(author), c.claimId, {
				bytes: bytesOf(laterCounts),
				originalName: 'pixels-later.csv'
			});
		});

		it('with the recorded settings gets the certificate’s result to the bit, with the frozen λ', async () => {
			expect(c.check.status).toBe('done');
			const rerun = await reRun(c);
			expect(rerun.status).toBe('done');
			expect(rerun.confidence).toBe(0.99);
			const result = rerun.result as unknown as TargetResult;
			expect(result).toEqual(certified);
			// Object.is: the exact lower bound and λ, not merely close.
			expect(Object.is(result.statistic.lower, certified.statistic.lower)).toBe(true);
			const claim = await getClaim(world.database, asUser(author), c.claimId);
			result.target.forEach((x, i) =>
				expect(Object.is(x, claim.target!.coefficients[i])).toBe(true)
			);
			expect(result.inputSha256).toBe(sha256Hex(bytesOf(counts)));
			if (kind === 'calibration-run') {
				// λ re-fitted on the stored run (its bytes from SQLite), never on the counts.
				const fit = fitTarget(parseCounts(bytesOf(run), d), sha256Hex(bytesOf(run)));
				expect(result.targetFit).toEqual(fit);
				expect(result.warnings[0]).toBe(fitCaution(fit));
				expect(claim.targetRun!.sha256).toBe(fit.runSha256);
			} else expect(result.targetFit).toBeUndefined();
			expect(rerun.comparison).toEqual({
				sameSeed: true,
				identical: true,
				withinError: true,
				firstDifference: null,
				engines: null
			});
			const body = await rendered(c, rerun);
			expect(body).toContain('Identical to the certificate, number for number.');
			expect(body).toContain(`data-testid="rerun-schmidt">${certified.certifiedSchmidtNumber}<`);
		});

		it('with a fresh seed gets the same result, and the page says the seed plays no part', async () => {
			const rerun = await reRun(c, 4242);
			expect(rerun.seed).toBe(4242);
			expect(rerun.result).toEqual(c.check.result);
			// No standard error to compare with: an exact bound agrees to the bit or not at all.
			expect(rerun.comparison).toEqual({
				sameSeed: false,
				identical: true,
				withinError: true,
				firstDifference: null,
				engines: null
			});
			const body = await rendered(c, rerun);
			expect(body).toContain('Identical to the certificate, number for number.');
			expect(body).toMatch(/exact limits/);
			expect(body).not.toMatch(/\(fresh\)|moved it|resampling noise|stated error/);
		});

		it('renders the whole review page: the certified bound, the frozen λ and the re-runs', async () => {
			const page = await reviewPage(c);
			expect(page).toContain(`data-testid="target-lower">${certified.statistic.lower.toFixed(5)}<`);
			expect(page).toContain(
				`data-testid="target-lambda">${certified.target.map((x) => x.toPrecision(6)).join(', ')}<`
			);
			expect(page).toMatch(kind === 'declared' ? /declared with the claim/ : /calibration run/);
			// The note under the cautions says where λ came from (it said "declared" for a fitted λ).
			expect(page).toMatch(
				kind === 'declared'
					? /carries the declared λ.*declared before the data/
					: /carries λ and the calibration run; its verifier re-fits λ/
			);
			if (kind === 'calibration-run') expect(page).not.toMatch(/carries the declared λ/);
			expect(page).toContain('no resampling (exact: the seed plays no part)');
			expect(page).toContain('data-testid="rerun-list"');
			expect(page).not.toMatch(/resampling noise|moved it/);
		});

		it('may change only the seed: another confidence is refused before anything runs', async () => {
			const before = await world.database.models.Check.count({ where: { claimId: c.claimId } });
			await expect(
				startRefereeCheck(world.database, c.referee, { confidence: 0.95 } as never)
			).rejects.toThrow(/confidence/);
			expect(await world.database.models.Check.count({ where: { claimId: c.claimId } })).toBe(
				before
			);
		});

		it('is never certified and stays out of the authors’ list of checks', async () => {
			const rerun = await reRun(c);
			const listed = (await listChecks(world.database, asUser(author), c.claimId)).map((x) => x.id);
			expect(listed).toContain(c.check.id);
			expect(listed).not.toContain(rerun.id);
			await expect(
				issueCertificate(world.database, asUser(author), c.claimId, rerun.id)
			).rejects.toBeInstanceOf(ConflictError);
		});
	}
);
