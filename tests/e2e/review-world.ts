/**
 * The review flow's starting point, written into a fresh data folder before the built app starts:
 * an admin (reads the mail outbox) and an author whose claim has a finished check and a
 * certificate. The editor has no account yet; they make one from the share notice.
 */
import { sessionKey } from '../../src/lib/server/accounts/auth';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { certify, parseCounts, sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import type { UserActor } from '../../src/lib/server/core/actor';
import { openDatabase, type Database } from '../../src/lib/server/db';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { createClaim } from '../../src/lib/server/claims/claims';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { datasetFilePath } from '../../src/lib/server/storage/counts-store';
import { newId } from '../../src/lib/server/core/ids';

export interface ReviewFlowWorld {
	dataDir: string;
	adminSession: string;
	authorSession: string;
	authorEmail: string;
	claimId: string;
	/** The certified check (an author may issue a newer certificate from it). */
	checkId: string;
	/** The certified check's lower bound, as the engine computed it. */
	certifiedLower: number;
	bundleSha256: string;
}

async function person(database: Database, name: string, accountRole: 'admin' | 'researcher') {
	const id = newId();
	const email = `${name.split(' ')[0].toLowerCase()}@example.test`;
	const { User, Session } = database.models;
	await User.create({
		id,
		email,
		name,
		passwordHash: 'unused',
		accountRole,
		emailVerifiedAt: new Date()
	});
	const session = newId().replaceAll('-', '');
	await Session.create({
		id: sessionKey(session),
		userId: id,
		expiresAt: new Date(Date.now() + 86_400_000)
	});
	const actor: UserActor = { kind: 'user', userId: id, accountRole, emailVerified: true };
	return { id, email, session, actor };
}

/** A done check with the engine's own result, as the check runner stores it. */
async function finishedCheck(
	database: Database,
	claimId: string,
	datasetId: string,
	userId: string
) {
	const claim = (await database.models.Claim.findByPk(claimId))!.get({ plain: true });
	const dataset = (await database.models.Dataset.findByPk(datasetId))!.get({ plain: true });
	const settings = { resamples: 400, confidence: 0.99, seed: 31 };
	const result = certify(
		parseCounts(readFileSync(datasetFilePath(dataset.sha256)), claim.dimension),
		{
			method: claim.method,
			bases: claim.bases,
			fourier: claim.fourier,
			...settings,
			claim: claim.claimedSchmidtNumber,
			inputSha256: dataset.sha256
		}
	);
	const id = newId();
	const now = new Date();
	await database.models.Check.create({
		...{ id, claimId, datasetId, createdBy: userId, status: 'done', progress: 1 },
		...{ ...settings, result, startedAt: now, finishedAt: now }
	});
	return { id, result };
}

export async function seedReviewFlow(): Promise<ReviewFlowWorld> {
	const dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-review-flow-'));
	process.env.RANKSEAL_DATA_DIR = dataDir;
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	const admin = await person(database, 'Ava Admin', 'admin');
	const author = await person(database, 'Ines Marlow', 'researcher');
	const groupId = newId();
	await database.models.Group.create({ id: groupId, name: 'Marlow Fibre Lab (fictional)' });
	await database.models.Membership.create({
		id: newId(),
		groupId,
		userId: author.id,
		role: 'lead'
	});
	const claim = await createClaim(database, author.actor, {
		title: 'Fibre pairs at d = 5 (review flow)',
		sourceDescription: 'Simulated isotropic pairs, visibility 0.9.',
		dimension: 5,
		method: 'mub-correlation',
		bases: [0, 1, 2],
		claimedSchmidtNumber: 3,
		manuscriptReference: null
	});
	const csv = toCountsCsv(sampledCounts(states.isotropic(5, 0.9), [0, 1, 2], 40_000, 17), ['test']);
	const dataset = await addDataset(database, author.actor, claim.id, {
		bytes: new TextEncoder().encode(csv),
		originalName: 'fibre.csv'
	});
	const check = await finishedCheck(database, claim.id, dataset.id, author.id);
	const certificate = await issueCertificate(database, author.actor, claim.id, check.id);
	const row = await database.models.Certificate.findByPk(certificate.id);
	await database.sequelize.close();
	return {
		dataDir,
		adminSession: admin.session,
		authorSession: author.session,
		authorEmail: author.email,
		claimId: claim.id,
		checkId: check.id,
		certifiedLower: check.result.statistic.lower,
		bundleSha256: row!.get('bundleSha256') as string
	};
}
