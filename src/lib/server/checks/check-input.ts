/** What a worker needs to run one check: the stored counts file's path and the claim's settings. */
import type { MessagePort } from 'node:worker_threads';
import type { Database } from '../db';
import type { CheckAttributes } from '../db/models/Check';
import { datasetFilePath } from '../storage/counts-store';
import type { CheckTask } from './task';
import { targetPart } from './target-task';
import { trialsPart } from './trials-task';

export async function checkTaskOf(
	database: Database,
	check: CheckAttributes,
	port: MessagePort
): Promise<CheckTask> {
	const { Claim, Dataset } = database.models;
	const dataset = (await Dataset.findByPk(check.datasetId))!.get({ plain: true });
	const claim = (await Claim.findByPk(check.claimId))!.get({ plain: true });
	return {
		datasetPath: datasetFilePath(dataset.sha256),
		sha256: dataset.sha256,
		dimension: claim.dimension,
		method: claim.method,
		bases: claim.bases,
		fourier: claim.fourier,
		resamples: check.resamples,
		confidence: check.confidence,
		seed: Number(check.seed),
		subtractAccidentals: !!check.subtractAccidentals,
		claim: claim.claimedSchmidtNumber,
		calibration: dataset.calibration ? new Uint8Array(dataset.calibration) : null,
		trials: trialsPart(claim),
		target: targetPart(claim),
		port
	};
}
