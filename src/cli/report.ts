/** The readable (non-JSON) report of the command line. */
import type { CertificationResult } from '../lib/certify';

const fmt = (x: number, digits = 5) => (Number.isFinite(x) ? x.toFixed(digits) : String(x));

/** The statistic, its bound and interval. */
function statisticLines(r: CertificationResult, file: string): string[] {
	const s = r.statistic;
	return [
		`Rankseal check of ${file}`,
		`  method            ${r.method} (${r.trust}); bases ${r.bases.join(', ')}; dimension ${r.dimension}`,
		`  Fourier basis     ${r.fourier === 'field' ? `field (GF(${r.dimension}) additive group)` : `cyclic (Z_${r.dimension} transform)`}`,
		`  statistic         ${fmt(s.value)} ± ${fmt(s.standardError)} (SE of the confidence draws; delta method ${fmt(s.deltaMethodStandardError)})`,
		...(s.floorValue === undefined
			? []
			: [`  floor P0 + P1 − 1 ${fmt(s.floorValue)} (F̃ is never below it)`]),
		...(s.plugInValue === undefined
			? []
			: [
					`  plug-in F̃        ${fmt(s.plugInValue)} (biased upward; the statistic above is the bound at confidence 1/2)`
				]),
		`  lower bound       ${fmt(s.lower)} at one-sided confidence ${r.confidence} [${s.boundMethod}]`,
		`    ${s.boundNote}`,
		`  95 % interval     [${fmt(s.interval95[0])}, ${fmt(s.interval95[1])}]`,
		`  effective visibility under a white-noise model ${fmt(r.effectiveVisibility, 4)}`,
		'',
		'  rung  bound      margin (SE)  white-noise threshold visibility of the witness'
	];
}

/** One line a rung of the ladder, then the Schmidt numbers reached. */
function ladderLines(r: CertificationResult): string[] {
	const lines: string[] = [];
	for (const b of r.bounds) {
		const margin = b.marginInStandardErrors === null ? 'n/a' : b.marginInStandardErrors.toFixed(1);
		const mark = r.statistic.lower > b.bound ? 'cleared' : '';
		lines.push(
			`  r=${String(b.upToSchmidtNumber).padEnd(3)} ${fmt(b.bound).padEnd(10)} ${margin.padStart(11)}  ${fmt(b.criticalVisibility, 4)}  ${mark}`
		);
	}
	lines.push('', `  Schmidt number at the point value  ≥ ${r.pointSchmidtNumber}`);
	lines.push(
		`  certified Schmidt number           ≥ ${r.certifiedSchmidtNumber}  (${r.resamples} resamples, seed ${r.seed})`
	);
	return lines;
}

/** Calibration, steering, entropic sums, the claim's verdict, the input and the warnings. */
function detailLines(r: CertificationResult): string[] {
	const lines: string[] = [];
	if (r.calibration)
		lines.push(
			`  calibrated bases  μ ≤ ${fmt(r.calibration.muUpper, 6)}, μ⁺ = ${fmt(r.calibration.muPlus, 6)} with ε = ${r.calibration.tolerance} (largest bias ${fmt(r.calibration.largestBias, 4)}); calibration SHA-256 ${r.calibration.sha256}`
		);
	if (r.calibrationTolerance) lines.push(`  calibration       ${r.calibrationTolerance.note}`);
	if (r.steeringRobustness)
		lines.push(
			`  steering robustness                ≥ ${fmt(r.steeringRobustness.lower, 4)} at the confidence bound (≥ ${fmt(r.steeringRobustness.value, 4)} at the point value; both are lower bounds)`
		);
	for (const e of r.entropicSums)
		lines.push(
			`  side ${e.side}, bases ${e.bases.join(' and ')}: H + H = ${fmt(e.bits, 3)} bits (Maassen–Uffink: at least log2 d = ${fmt(e.log2Dimension, 3)})`
		);
	if (r.claim) {
		lines.push(
			`  claim: Schmidt number ≥ ${r.claim.schmidtNumber} is ${r.claim.verdict.toUpperCase()}`
		);
		if (r.claim.shortfall) lines.push(`    ${r.claim.shortfall}`);
	}
	lines.push(`  input SHA-256 ${r.inputSha256}`);
	for (const w of r.warnings) lines.push(`  note: ${w}`);
	return lines;
}

export function readableReport(r: CertificationResult, file: string): string {
	const lines = [...statisticLines(r, file), ...ladderLines(r), ...detailLines(r)];
	const trusted =
		r.trust === 'device-dependent'
			? 'calibrated measurements in the declared bases'
			: 'a trusted measurement on side B';
	lines.push(
		'',
		'  A statistical statement under stated assumptions: i.i.d. trials, fair sampling of',
		`  detected pairs, ${trusted}.`,
		'  It is not a substitute for peer review.'
	);
	return lines.join('\n');
}
