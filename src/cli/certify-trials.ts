/**
 * `certify --trials FILE`: the certificate from time-ordered trials (witnesses.md §10), with the
 * i.i.d. certificate of the same trials summed beside it. Settings that fail the randomness check
 * are refused: exit status 2 with the check's message (the JSON still carries every number).
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { InputError } from '../lib/certify';
import { certifyTrials, parseTrials, type TrialsResult } from '../lib/certify/trials';
import { plainTrialsBytes } from '../lib/certify/trials/inflate';

export interface TrialsArguments {
	file: string;
	dimension: number;
	method: string;
	mode: string | undefined;
	bases: number[] | undefined;
	probabilities: number[] | undefined;
	confidence: number | undefined;
	json: boolean;
}

const fmtP = (r: { p: number; log10P: number }) =>
	r.p > 0 ? r.p.toExponential(2) : `10^${r.log10P.toFixed(1)}`;

export function readableTrials(r: TrialsResult, file: string): string {
	const lines = [
		`Rankseal check of time-ordered trials ${file}`,
		`  ${r.label}`,
		...(r.condition ? [`  blocks: ${r.condition}`] : []),
		`  method ${r.method}; bases ${r.bases.join(', ')} with probabilities ${r.probabilities.map((p) => p.toFixed(4)).join(', ')}; dimension ${r.dimension}`,
		`  ${r.trials} trials${r.blocks === null ? '' : ` in ${r.blocks} blocks`}; mean Z ${r.meanZ.toFixed(5)}; bets ${r.betting.rule} (${r.betting.reference})`,
		'',
		'  rung  null mean B_r/m  p_r (test supermartingale)'
	];
	for (const rung of r.rungs)
		lines.push(
			`  r=${String(rung.rung).padEnd(3)} ${rung.nullMean.toFixed(5).padEnd(16)} ${fmtP(rung)}${rung.p <= r.alpha ? '  rejected' : ''}`
		);
	lines.push(
		'',
		`  certified Schmidt number (closed testing at α = ${r.alpha.toPrecision(3)})  ≥ ${r.certifiedSchmidtNumber}`
	);
	if (r.next)
		lines.push(
			r.next.unitsNeeded === null
				? `  rung ${r.next.rung}: the observed mean of Z does not exceed its null mean; more ${r.next.unit} cannot help`
				: `  rung ${r.next.rung}: about ${r.next.unitsNeeded} ${r.next.unit} at the observed rate would reach it`
		);
	const iid =
		'error' in r.iid ? `not available (${r.iid.error})` : `≥ ${r.iid.certifiedSchmidtNumber}`;
	lines.push(`  i.i.d. certificate of the same trials summed (for comparison)  ${iid}`);
	if (r.settings.message) lines.push(`  settings: ${r.settings.message}`);
	return lines.join('\n');
}

export function runTrials(a: TrialsArguments): number {
	if (a.mode !== undefined && a.mode !== 'trials' && a.mode !== 'blocks')
		throw new InputError(`--mode must be trials or blocks, got '${a.mode}'`);
	let bytes: Uint8Array;
	try {
		bytes = readFileSync(a.file);
	} catch (error) {
		throw new InputError(
			`cannot read --trials ${a.file}: ${(error as NodeJS.ErrnoException).code ?? 'error'}`
		);
	}
	// A gzip-compressed file is read as the service reads an upload of it (one source: inflate.ts).
	const data = parseTrials(plainTrialsBytes(bytes), a.dimension, a.mode ?? 'trials');
	const result = certifyTrials(data, {
		method: a.method,
		bases: a.bases,
		probabilities: a.probabilities,
		confidence: a.confidence,
		inputSha256: createHash('sha256').update(bytes).digest('hex')
	});
	process.stdout.write((a.json ? JSON.stringify(result) : readableTrials(result, a.file)) + '\n');
	if (result.settings.passed) return 0;
	process.stderr.write(`rankseal: refused: ${result.settings.message}\n`);
	return 2;
}
