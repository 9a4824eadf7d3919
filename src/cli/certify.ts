/**
 * rankseal certify: check a counts file against a witness family from the command line.
 *   npm run --silent certify -- --counts FILE [--counts FILE … --file-basis 0,1,…] --dimension D --method METHOD
 *       [--fourier cyclic|field] [--bases 0,1] [--confidence 0.99865] [--resamples 10000] [--seed 1]
 *       [--claim K] [--json] [--threads N] [--calibration FILE]
 *   npm run --silent certify -- --trials FILE --dimension D --method METHOD [--mode trials|blocks]
 *       [--bases 0,1] [--probabilities 0.5,0.5] [--confidence C] [--json]
 * Blocks of resamples run on worker threads when the work repays it (same numbers for any N).
 * Exit status: 0 success, 2 bad input (one line on stderr), 1 internal error.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import {
	certifyInBlocks,
	checkDeclaredFourier,
	DEFAULTS,
	fourierProblem,
	InputError,
	isFourierConvention,
	isMethodId,
	METHOD_IDS,
	parseCounts,
	type FourierConvention
} from '../lib/certify';
import { parseCalibration } from '../lib/certify/calibration';
import { certifyTarget } from '../lib/certify/fidelity-target';
import { adviceInWords, countsAdvice } from '../lib/certify/planner/check-counts';
import { fitCaution, fitFromRun } from './target-from-run';
import { threadedBlocks } from './blocks';
import { runTrials } from './certify-trials';
import { readCountsFiles } from './counts-files';
import { readableReport } from './report';

const USAGE = `usage: npm run --silent certify -- --counts FILE --dimension D --method ${METHOD_IDS.join('|')}
       [--fourier cyclic|field] [--bases 0,1] [--confidence ${DEFAULTS.confidence}] [--resamples ${DEFAULTS.resamples}]
       [--seed ${DEFAULTS.seed}] [--claim K] [--json] [--subtract-accidentals] [--threads N] [--calibration FILE]
  --method fidelity-target --target l0,l1,…  fidelity with the declared target Σ λ_m |mm⟩ (witnesses.md §4.3′):
             basis 0 the computational table, basis 1 the table in the tilted vectors, same integration time
  --counts   given several times: the files are read as one dataset (one d × d grid per basis, or full files);
             --file-basis 0,1,… gives the basis of each file holding one bare grid, in order (blank: in the file)
  --target-from RUN  instead of --target: λ fitted on a separate calibration run's computational table
             (λ_m² its share of the matching pairs) and frozen; refused when RUN holds the certified counts
  --calibration  the basis vectors as measured (JSON, witnesses.md §4.4; mub-correlation only): the ladder then
             uses their overlaps instead of assuming exactly unbiased bases
   or: npm run --silent certify -- --trials FILE --dimension D --method mub-correlation|steering-2mub
       [--mode trials|blocks] [--bases 0,1] [--probabilities 0.5,0.5] [--confidence C] [--json]
  --trials   time-ordered CSV basis,outcome_a,outcome_b[,time_s][,block]: p-values valid without the
             i.i.d. assumption (random settings independent of the source; fair sampling of detected pairs)
  --fourier  which Fourier basis basis 1 is: cyclic = the Z_d transform d^-1/2 Σ ω^jm |m⟩ (every d; the default
             unless a JSON file declares "fourier"), field = the GF(p^s) basis and its d + 1 MUBs (prime powers
             only); for prime d the two are the same bases`;

function wholeNumber(name: string, text: string | undefined): number | undefined {
	if (text === undefined) return undefined;
	if (!/^\d+$/.test(text.trim()))
		throw new InputError(`--${name} must be a whole number, got '${text}'`);
	return Number(text);
}

function decimal(name: string, text: string | undefined): number | undefined {
	if (text === undefined) return undefined;
	const value = Number(text);
	if (text.trim() === '' || !Number.isFinite(value))
		throw new InputError(`--${name} must be a number, got '${text}'`);
	return value;
}

function fourierOption(text: string | undefined, d: number): FourierConvention | undefined {
	if (text === undefined) return undefined;
	if (!isFourierConvention(text))
		throw new InputError(`--fourier must be cyclic or field, got '${text}'`);
	const problem = fourierProblem(d, text);
	if (problem) throw new InputError(`--fourier: ${problem}`);
	return text;
}

function readCalibration(path: string | undefined, d: number) {
	if (path === undefined) return {};
	let bytes: Uint8Array;
	try {
		bytes = readFileSync(path);
	} catch (error) {
		throw new InputError(
			`cannot read --calibration ${path}: ${(error as NodeJS.ErrnoException).code ?? 'error'}`
		);
	}
	return {
		calibration: parseCalibration(bytes, d),
		calibrationSha256: createHash('sha256').update(bytes).digest('hex')
	};
}

/** `--method fidelity-target`: exact bounds, no resampling (src/lib/certify/fidelity-target). */
function runTarget(
	values: Record<string, string | boolean | undefined>,
	{ bytes, label }: { bytes: Uint8Array; label: string }
): number {
	const from = values['target-from'];
	if ((typeof values.target === 'string') === (typeof from === 'string'))
		throw new InputError(
			'--method fidelity-target needs exactly one of --target l0,l1,… and --target-from RUN'
		);
	const dimension = wholeNumber('dimension', values.dimension as string)!;
	const dataset = parseCounts(bytes, dimension);
	const inputSha256 = createHash('sha256').update(bytes).digest('hex');
	const fit =
		typeof from === 'string' ? fitFromRun(from, dimension, dataset, inputSha256) : undefined;
	const target = fit
		? fit.coefficients
		: (values.target as string).split(',').map((x) => decimal('target', x)!);
	const checked = certifyTarget(dataset, {
		target,
		confidence: decimal('confidence', values.confidence as string | undefined),
		claim: wholeNumber('claim', values.claim as string | undefined),
		inputSha256
	});
	const result = fit
		? { ...checked, warnings: [fitCaution(fit), ...checked.warnings], targetFit: fit }
		: checked;
	const s = result.statistic;
	const readable = [
		`Rankseal check of ${label}: fidelity-target, d = ${dimension}`,
		`  F̃ = ${s.value.toFixed(5)}, lower bound ${s.lower.toFixed(5)} at ${result.confidence}`,
		`  ladder Σ λ² up to r: ${result.bounds.map((b) => b.bound.toFixed(5)).join(', ')}`,
		`  certified Schmidt number ≥ ${result.certifiedSchmidtNumber}` +
			(result.claim ? `; claim ≥ ${result.claim.schmidtNumber} ${result.claim.verdict}` : ''),
		...result.warnings.map((w) => `  note: ${w}`)
	].join('\n');
	process.stdout.write((values.json ? JSON.stringify(result) : readable) + '\n');
	return 0;
}

function trialsRun(values: Record<string, string | boolean | string[] | undefined>): number {
	for (const required of ['dimension', 'method'] as const)
		if (!values[required]) throw new InputError(`--${required} is required`);
	const text = (name: string) => values[name] as string | undefined;
	return runTrials({
		file: text('trials')!,
		dimension: wholeNumber('dimension', text('dimension'))!,
		method: text('method')!,
		mode: text('mode'),
		bases: text('bases')
			?.split(',')
			.map((b) => wholeNumber('bases', b)!),
		probabilities: text('probabilities')
			?.split(',')
			.map((p) => decimal('probabilities', p)!),
		confidence: decimal('confidence', text('confidence')),
		json: values.json === true
	});
}

/** The command line's options, read strictly (an unknown option is bad input). */
function readArgs(argv: string[]) {
	return parseArgs({
		args: argv,
		options: {
			counts: { type: 'string', multiple: true },
			'file-basis': { type: 'string' },
			trials: { type: 'string' },
			mode: { type: 'string' },
			probabilities: { type: 'string' },
			dimension: { type: 'string' },
			method: { type: 'string' },
			bases: { type: 'string' },
			fourier: { type: 'string' },
			confidence: { type: 'string' },
			resamples: { type: 'string' },
			seed: { type: 'string' },
			claim: { type: 'string' },
			threads: { type: 'string' },
			calibration: { type: 'string' },
			target: { type: 'string' },
			'target-from': { type: 'string' },
			json: { type: 'boolean', default: false },
			'subtract-accidentals': { type: 'boolean', default: false },
			help: { type: 'boolean', default: false }
		},
		strict: true,
		allowPositionals: false
	}).values;
}

async function run(argv: string[]): Promise<number> {
	const values = readArgs(argv);
	if (values.help) {
		process.stdout.write(USAGE + '\n');
		return 0;
	}
	if (values.trials) return trialsRun(values);
	for (const required of ['counts', 'dimension', 'method'] as const) {
		if (!values[required]) throw new InputError(`--${required} is required`);
	}
	const counts = readCountsFiles(values.counts!, values['file-basis']);
	if (values.method === 'fidelity-target')
		return runTarget({ ...values, counts: undefined }, counts);
	if (!isMethodId(values.method!)) {
		throw new InputError(
			`--method must be one of ${METHOD_IDS.join(', ')}, got '${values.method}'`
		);
	}
	const dimension = wholeNumber('dimension', values.dimension)!;
	const fourier = fourierOption(values.fourier, dimension);
	const bases = values.bases?.split(',').map((b) => wholeNumber('bases', b)!);
	const { bytes, label } = counts;
	const dataset = parseCounts(bytes, dimension);
	if (fourier) checkDeclaredFourier(dataset, fourier, `--fourier ${fourier}`);
	const calibration = readCalibration(values.calibration, dimension);
	const options = {
		method: values.method!,
		bases,
		fourier,
		confidence: decimal('confidence', values.confidence),
		resamples: wholeNumber('resamples', values.resamples),
		seed: wholeNumber('seed', values.seed),
		claim: wholeNumber('claim', values.claim),
		subtractAccidentals: values['subtract-accidentals'],
		inputSha256: createHash('sha256').update(bytes).digest('hex'),
		...calibration
	};
	const threads = wholeNumber('threads', values.threads);
	const result = await certifyInBlocks(dataset, options, threadedBlocks(threads));
	if (values.json) process.stdout.write(JSON.stringify(result) + '\n');
	else {
		// Simulated after the check, as the service does; --json gives the result alone.
		const advice = countsAdvice(dataset, options, result);
		const words = advice ? [`  counts needed: ${adviceInWords(advice, result.totalCounts)}`] : [];
		process.stdout.write([readableReport(result, label), ...words].join('\n') + '\n');
	}
	return 0;
}

function failed(error: unknown): number {
	const badInput =
		error instanceof InputError || (error as { code?: string }).code?.startsWith('ERR_PARSE_ARGS');
	process.stderr.write(
		`rankseal: ${(error as Error).message.split('\n')[0]}${badInput ? '' : ' (internal error)'}\n`
	);
	if (!badInput) process.stderr.write(`${USAGE.split('\n')[0]}\n`);
	return badInput ? 2 : 1;
}

run(process.argv.slice(2)).then(
	(code) => (process.exitCode = code),
	(error) => (process.exitCode = failed(error))
);
