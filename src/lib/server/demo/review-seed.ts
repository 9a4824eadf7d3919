/**
 * The demo's review scene: the first demo claim certified and shared with the demo editor, a
 * review link whose URL goes to data/demo/review-link.txt, a second link whose referee has filed
 * a report, and an API token for the editor in data/demo/editor-token.txt.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { userActor } from '../core/actor';
import { startCheckRunner } from '../checks/registry';
import { config } from '../core/config';
import type { Database } from '../db';
import { issueCertificate } from '../certificates/certificates';
import { saveReport } from '../review/reports';
import { createReviewLink, resolveReviewToken } from '../review/review-links';
import { shareClaim } from '../review/shares';
import { createToken } from '../accounts/tokens';

export const demoReviewLinkFile = () => path.join(config().dataDir, 'demo', 'review-link.txt');
export const demoEditorTokenFile = () => path.join(config().dataDir, 'demo', 'editor-token.txt');

export const DEMO_SHARE = {
	journal: 'Quarterly Optics Letters (fictional)',
	manuscript: 'QOL-2026-0317'
};

function writeSecret(file: string, text: string) {
	mkdirSync(path.dirname(file), { recursive: true });
	writeFileSync(file, text + '\n', { mode: 0o600 });
}

/**
 * The claim's check once every demo check has finished (the runner is awaited): issuing while the
 * runner still writes progress would meet a busy database (issue 7 §3).
 */
async function finishedCheckId(database: Database, claimId: string): Promise<string> {
	await (await startCheckRunner(database)).idle();
	const check = await database.models.Check.findOne({
		where: { claimId, status: 'done', reviewLinkId: null }
	});
	if (!check) throw new Error('demo: the check of the claim to share did not finish');
	return check.get('id') as string;
}

export async function seedReview(
	database: Database,
	people: { author: string; editor: string },
	claimId: string
): Promise<void> {
	const author = (await userActor(database, people.author))!;
	const editor = (await userActor(database, people.editor))!;
	const editorEmail = (await database.models.User.findByPk(people.editor))!.get('email') as string;
	const checkId = await finishedCheckId(database, claimId);
	// certify-demo.ts certifies supported claims; issue here only if it has not.
	const valid = await database.models.Certificate.count({ where: { claimId, status: 'valid' } });
	if (!valid) await issueCertificate(database, author, claimId, checkId);
	await shareClaim(database, author, claimId, { email: editorEmail, ...DEMO_SHARE });
	const open = await createReviewLink(database, editor, claimId, { label: 'Referee A (demo)' });
	writeSecret(demoReviewLinkFile(), open.url);
	const filed = await createReviewLink(database, editor, claimId, { label: 'Referee B (demo)' });
	const token = new URL(filed.url).pathname.split('/').at(-1)!;
	const referee = await resolveReviewToken(database, token, { method: 'SEED', path: '/demo' });
	await saveReport(database, referee!, {
		recommendation: 'needs-revision',
		comments:
			'The certified bound holds when re-run with the recorded seed. Please state the dead time of the detectors and how the time bins were aligned (demo report).',
		submit: true
	});
	const { token: apiToken } = await createToken(database, editor, { name: 'demo editor' });
	writeSecret(demoEditorTokenFile(), apiToken);
}
