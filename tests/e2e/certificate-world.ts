/**
 * Claims with finished checks, written straight into an API world's SQLite file and data folder
 * before the built app starts on it, so that certificate tests need not wait for checks. Each
 * check row holds the engine's real result for its settings, as the check runner stores it.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { certify, parseCounts, sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import { sha256Hex } from '../../src/lib/evidence/hash';
import { openDatabase } from '../../src/lib/server/db';
import { summarise } from '../../src/lib/server/checks/summary';
import { newId } from '../../src/lib/server/core/ids';

export interface FinishedClaim {
	claimId: string;
	checkId: string;
	fileName: string;
	csv: string;
}

const DIMENSION = 5;
const BASES = [0, 1, 2];

/** `count` claims of the first lead's group (ada@example.test), each with one finished check. */
export async function addFinishedClaims(
	dataDir: string,
	count: number,
	resamples = 200
): Promise<FinishedClaim[]> {
	const database = await openDatabase(path.join(dataDir, 'rankseal.sqlite'));
	const { User, Membership, Claim, Dataset, Check } = database.models;
	const userId = (await User.findOne({ where: { email: 'ada@example.test' } }))!.get(
		'id'
	) as string;
	const groupId = (await Membership.findOne({ where: { userId } }))!.get('groupId') as string;
	const made: FinishedClaim[] = [];
	for (let i = 0; i < count; i++) {
		const csv = toCountsCsv(
			sampledCounts(states.isotropic(DIMENSION, 0.9), BASES, 40_000, 31 + i),
			['simulated']
		);
		const bytes = new TextEncoder().encode(csv);
		const sha256 = sha256Hex(bytes);
		const file = path.join(dataDir, 'files', sha256.slice(0, 2), sha256);
		mkdirSync(path.dirname(file), { recursive: true });
		writeFileSync(file, bytes);
		const claimId = newId();
		const fields = { dimension: DIMENSION, method: 'mub-correlation' as const, bases: BASES };
		await Claim.create({
			id: claimId,
			groupId,
			createdBy: userId,
			title: `Time-bin pairs, run ${i + 1}`,
			sourceDescription: 'Simulated isotropic source, visibility 0.9',
			...fields,
			fourier: 'cyclic',
			claimedSchmidtNumber: 3,
			manuscriptReference: null,
			state: 'checked'
		});
		const parsed = parseCounts(bytes, DIMENSION);
		const datasetId = newId();
		const fileName = `run${i + 1}.csv`;
		await Dataset.create({
			id: datasetId,
			claimId,
			createdBy: userId,
			sha256,
			byteSize: bytes.byteLength,
			format: 'csv',
			originalName: fileName,
			summary: summarise(parsed, 'cyclic')
		});
		const settings = { resamples, confidence: 0.99, seed: 5 + i };
		const result = certify(parsed, { ...fields, ...settings, claim: 3, inputSha256: sha256 });
		const checkId = newId();
		await Check.create({
			id: checkId,
			claimId,
			datasetId,
			createdBy: userId,
			status: 'done',
			progress: 1,
			...settings,
			result,
			startedAt: new Date(),
			finishedAt: new Date()
		});
		made.push({ claimId, checkId, fileName, csv });
	}
	await database.sequelize.close();
	return made;
}
