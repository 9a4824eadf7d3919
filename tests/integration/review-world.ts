/**
 * A certified claim in a fresh SQLite file and data folder, with the real mail catcher, the real
 * check runner (bundled worker) and the bundled verifier: what sharing and review links need.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { bundleCheckWorker } from '../../src/lib/server/checks/locate';
import { stopCheckRunner } from '../../src/lib/server/checks/registry';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { asUser } from './actors';
import { addGroup, addUser, bytesOf, claimFields, countsCsv } from './backend-fixtures';
import { finishedCheck, type EvidenceWorld } from './evidence-world';
import { mailWorld, type MailWorld } from './mail-world';

export interface ReviewWorld {
	mail: MailWorld;
	lead: string;
	author: string;
	outsider: string;
	editor: string;
	editorEmail: string;
	otherEditor: string;
	claimId: string;
	otherClaimId: string;
	certificateId: string;
	certifiedCheckId: string;
	close(): Promise<void>;
}

async function certifiedClaim(mail: MailWorld, groupId: string, author: string, seed: number) {
	const { database } = mail;
	const claim = await createClaim(database, asUser(author), {
		...claimFields,
		manuscriptReference: null
	});
	const dataset = await addDataset(database, asUser(author), claim.id, {
		bytes: bytesOf(countsCsv(5, [0, 1, 2], 40_000, seed)),
		originalName: `run-${seed}.csv`
	});
	const shape = { ctx: mail, database, author, claimId: claim.id, datasetId: dataset.id };
	const check = await finishedCheck(shape as unknown as EvidenceWorld, seed, 400);
	const certificate = await issueCertificate(database, asUser(author), claim.id, check.id);
	return { claimId: claim.id, checkId: check.id, certificateId: certificate.id, groupId };
}

export async function reviewWorld(): Promise<ReviewWorld> {
	const mail = await mailWorld();
	const tools = mkdtempSync(path.join(tmpdir(), 'rankseal-review-tools-'));
	process.env.RANKSEAL_DATA_DIR = mail.folder;
	process.env.ORIGIN = 'http://rankseal.test';
	process.env.RANKSEAL_CHECK_WORKERS = '1';
	process.env.RANKSEAL_CHECK_WORKER = await bundleCheckWorker(path.join(tools, 'worker.mjs'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(tools, 'verify.mjs'));
	const { database } = mail;
	const lake = await addGroup(database, 'Lake optics');
	const ridge = await addGroup(database, 'Ridge qudits');
	const lead = await addUser(database, 'Ada Lind', [[lake, 'lead']]);
	const author = await addUser(database, 'Bo Strand', [[lake, 'author']]);
	const outsider = await addUser(database, 'Cyd Marsh', [[ridge, 'lead']]);
	const editor = await addUser(database, 'Eda Kern');
	const otherEditor = await addUser(database, 'Fen Olde');
	await database.models.User.update(
		{ accountRole: 'editor' },
		{ where: { id: [editor, otherEditor] } }
	);
	const editorEmail = (await database.models.User.findByPk(editor))!.get('email') as string;
	const main = await certifiedClaim(mail, lake, author, 11);
	const other = await certifiedClaim(mail, ridge, outsider, 12);
	return {
		mail,
		lead,
		author,
		outsider,
		editor,
		editorEmail,
		otherEditor,
		claimId: main.claimId,
		otherClaimId: other.claimId,
		certificateId: main.certificateId,
		certifiedCheckId: main.checkId,
		close: async () => {
			await stopCheckRunner(database);
			await mail.close();
			rmSync(tools, { recursive: true, force: true });
		}
	};
}
