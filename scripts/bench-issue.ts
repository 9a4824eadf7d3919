/**
 * The end-to-end time to issue a certificate, in-process with the services and a temporary data
 * folder (the integration tests' fixtures): the check (engine, stored as the runner stores it),
 * then issuing (re-run, manifest, signature, PDF, evidence bundle, ledger). A benchmark part.
 */
import { performance } from 'node:perf_hooks';
import { resamplesCeiling } from '../src/lib/certify';
import { isotropicCounts, toCountsJson } from '../src/lib/certify/planner/white-counts';
import { issueCertificate } from '../src/lib/server/certificates/certificates';
import { createClaim } from '../src/lib/server/claims/claims';
import { addDataset } from '../src/lib/server/datasets/datasets';
import { bytesOf, claimFields, countsCsv } from '../tests/integration/backend-fixtures';
import { evidenceWorld, finishedCheck } from '../tests/integration/evidence-world';

export interface IssueTime {
	d: number;
	method: string;
	check: number;
	issue: number;
	resamples: number;
}

export async function issueTimes(dimensions: number[], resamples: number): Promise<IssueTime[]> {
	const world = await evidenceWorld();
	const method = 'fidelity-two-basis';
	try {
		// One issue at d = 5 first: it loads the fonts and the verifier, as a running server has.
		const times: IssueTime[] = [];
		for (const d of [5, ...dimensions]) {
			const claim = await createClaim(world.database, world.author, {
				...claimFields,
				title: `Bench d = ${d}`,
				dimension: d,
				method,
				claimedSchmidtNumber: 2
			});
			// Above d = 256 the JSON form (a CSV of 10⁶ rows a basis passes the file limit).
			const large = d > 256;
			const text = large
				? toCountsJson(isotropicCounts(d, 0.9, [0, 1], 1e6, 7))
				: countsCsv(d, [0, 1], 1e6, 7);
			const dataset = await addDataset(world.database, world.author, claim.id, {
				bytes: bytesOf(text),
				originalName: `bench-d${d}.${large ? 'json' : 'csv'}`
			});
			const draws = Math.min(resamples, resamplesCeiling(d, 2));
			const start = performance.now();
			const check = await finishedCheck(world, 1, draws, {
				claimId: claim.id,
				datasetId: dataset.id
			});
			const checked = performance.now();
			await issueCertificate(world.database, world.lead, claim.id, check.id);
			const issued = performance.now();
			if (d !== 5)
				times.push({
					d,
					method,
					check: (checked - start) / 1000,
					issue: (issued - checked) / 1000,
					resamples: draws
				});
		}
		return times;
	} finally {
		await world.ctx.close();
	}
}
