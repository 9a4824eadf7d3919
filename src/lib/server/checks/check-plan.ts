/**
 * The planner with a finished check as its model (issue 19 §3): the check's own tables, proportions
 * between bases, Fourier convention and calibration, its rungs and effective visibility, and the
 * counts for 90 % power at Schmidt number k, simulated from those tables (planner/check-counts.ts).
 * Only for callers who may read the check. For the check's own claim the advice stored after the
 * check is the answer; another k is simulated here, rate-limited like any plan that simulates.
 */
import { readFile } from 'node:fs/promises';
import { certify, parseCounts, type CertificationResult } from '$lib/certify';
import { parseCalibration } from '$lib/certify/calibration';
import { isTargetResult } from '$lib/certify/fidelity-target';
import { isTrialsResult } from '$lib/certify/trials';
import { countsAdvice, type CountsAdvice } from '$lib/certify/planner/check-counts';
import type { Actor } from '../core/actor';
import type { Database } from '../db';
import { takeOrRefuse } from '../core/rate-limits';
import { datasetFilePath } from '../storage/counts-store';
import { ConflictError } from '../core/errors';
import { FieldError } from '../core/field-error';
import { getCheck } from './checks';

export interface CheckPlan {
	model: 'check';
	checkId: string;
	method: CertificationResult['method'];
	dimension: number;
	bases: number[];
	schmidtNumber: number;
	/** The check's effective visibility under a white-noise reading of its statistic. */
	visibility: number;
	criticalVisibility: number;
	rungs: { upToSchmidtNumber: number; bound: number; criticalVisibility: number }[];
	/** null: k is already certified by the check, or more counts cannot help (see `note`). */
	counts: CountsAdvice | null;
	note: string | null;
}

async function simulated(
	database: Database,
	result: CertificationResult,
	datasetId: string,
	k: number
) {
	const dataset = (await database.models.Dataset.findByPk(datasetId))!.get({ plain: true });
	const data = parseCounts(await readFile(datasetFilePath(dataset.sha256)), result.dimension);
	const calibration = dataset.calibration
		? { calibration: parseCalibration(new Uint8Array(dataset.calibration), result.dimension) }
		: {};
	const options = {
		...calibration,
		method: result.method,
		bases: result.bases,
		fourier: result.fourier,
		confidence: result.confidence,
		resamples: result.resamples,
		seed: result.seed,
		subtractAccidentals: result.backgroundSubtracted,
		claim: k
	};
	return countsAdvice(data, options, certify(data, options));
}

export async function planFromCheck(
	database: Database,
	actor: Actor,
	checkId: string,
	schmidtNumber: number | undefined,
	address: string
): Promise<CheckPlan> {
	const check = await getCheck(database, actor, checkId);
	const result = check.result as unknown;
	if (check.status !== 'done' || !result)
		throw new ConflictError('Only a finished check can be the planner’s model.');
	if (isTrialsResult(result) || isTargetResult(result))
		throw new ConflictError(
			'The planner takes a witness family’s check as its model, not this kind.'
		);
	const r = result as CertificationResult;
	const k = schmidtNumber ?? r.claim?.schmidtNumber ?? r.certifiedSchmidtNumber + 1;
	if (!Number.isInteger(k) || k < 2 || k > r.dimension)
		throw new FieldError(
			'schmidtNumber',
			`must be a whole number from 2 to the dimension ${r.dimension}`
		);
	const rungs = r.bounds.map((b) => ({
		upToSchmidtNumber: b.upToSchmidtNumber,
		bound: b.bound,
		criticalVisibility: b.criticalVisibility
	}));
	const base = {
		model: 'check' as const,
		checkId,
		method: r.method,
		dimension: r.dimension,
		bases: r.bases,
		schmidtNumber: k,
		visibility: r.effectiveVisibility,
		criticalVisibility: rungs[k - 2].criticalVisibility,
		rungs
	};
	if (r.certifiedSchmidtNumber >= k)
		return { ...base, counts: null, note: `The check already certifies Schmidt number ${k}.` };
	// The claim's own k was simulated after the check; another k (or an older check) is simulated here.
	const stored = k === r.claim?.schmidtNumber ? check.countsAdvice : null;
	if (!stored)
		await takeOrRefuse(
			'planSimulations',
			address,
			'Too many plans with simulated counts from this address.'
		);
	const counts = stored ?? (await simulated(database, r, check.datasetId, k));
	const note = counts
		? null
		: `At the check's own tables more counts cannot be shown to certify Schmidt number ${k}.`;
	return { ...base, counts, note };
}
