/**
 * rankseal plan: before measuring, what it takes to certify Schmidt number k.
 *   npm run --silent plan -- --method METHOD --dimension D --schmidt-number K --visibility ETA
 *       [--bases 0,1|all] [--confidence 0.99865] [--simulate all|requested|none] [--json]
 * Counts for 90 % power come from simulating the engine (docs/statistics.md §8); every design is
 * simulated here unless told otherwise (the web page simulates only the one asked for).
 * Exit status: 0 success, 2 bad input (one line on stderr), 1 internal error.
 */
import { parseArgs } from 'node:util';
import { ZodError } from 'zod';
import { InputError, METHOD_IDS } from '../lib/certify';
import {
	planExperiment,
	type DesignPlan,
	type ExperimentPlan
} from '../lib/certify/planner/plan-experiment';
import { parsePlanQuery } from '../lib/certify/planner/query';
import { planTarget } from '../lib/certify/planner/plan-target';
import { parseTargetPlanQuery } from '../lib/certify/planner/target-query';
import { readableTargetPlan } from './plan-target';

const USAGE = `usage: npm run --silent plan -- --method ${METHOD_IDS.join('|')} --dimension D --schmidt-number K
       --visibility ETA [--bases 0,1|all] [--confidence 0.99865] [--simulate all|requested|none] [--json]
   or: npm run --silent plan -- --method fidelity-target --target l0,l1,… --schmidt-number K --visibility ETA
       [--confidence 0.99865] [--json]`;

const fixed = (x: number | null, digits = 4) => (x === null ? '–' : x.toFixed(digits));

function designLine(p: DesignPlan): string {
	const counts =
		p.countsPerBasis === null
			? (p.note ?? '')
			: `${p.countsPerBasis} per basis, ${p.totalCounts} in all (power ${fixed(p.power, 3)})`;
	return `  ${p.method.padEnd(19)} ${String(p.bases.length).padStart(4)} bases  η* ${fixed(p.criticalVisibility)}  ${counts}`;
}

export function readablePlan(plan: ExperimentPlan): string {
	const r = plan.request;
	const s = plan.simulation;
	const lines = [
		`Plan: ${r.method}, d = ${r.dimension}, bases ${r.bases.join(',')}, Schmidt number ≥ ${r.schmidtNumber} at visibility ${r.visibility} (white noise), confidence ${r.confidence}`,
		`Critical visibility for this rung: ${fixed(plan.design.criticalVisibility)}`,
		`Counts for ${100 * s.target} % power (${s.experiments} simulated checks per level, ${s.resamples} resamples each, seed ${s.seed}):`,
		designLine(plan.design),
		'Other designs (the trade-offs):',
		...plan.alternatives.map(designLine),
		`Critical visibility against d (Schmidt number ≥ ${r.schmidtNumber}):`,
		...plan.curve.map(
			(p) => `  d = ${String(p.dimension).padStart(4)}  η* ${fixed(p.criticalVisibility)}`
		)
	];
	return lines.join('\n');
}

function run(argv: string[]): number {
	const { values } = parseArgs({
		args: argv,
		options: {
			method: { type: 'string' },
			dimension: { type: 'string' },
			'schmidt-number': { type: 'string' },
			visibility: { type: 'string' },
			bases: { type: 'string' },
			target: { type: 'string' },
			confidence: { type: 'string' },
			simulate: { type: 'string', default: 'all' },
			json: { type: 'boolean', default: false },
			help: { type: 'boolean', default: false }
		},
		strict: true,
		allowPositionals: false
	});
	if (values.help) {
		process.stdout.write(USAGE + '\n');
		return 0;
	}
	if (values.method === 'fidelity-target') {
		const { target, confidence, visibility } = values;
		const plan = planTarget(
			parseTargetPlanQuery({
				method: values.method,
				target,
				confidence,
				visibility,
				dimension: values.dimension,
				schmidtNumber: values['schmidt-number']
			})
		);
		process.stdout.write((values.json ? JSON.stringify(plan) : readableTargetPlan(plan)) + '\n');
		return 0;
	}
	const request = parsePlanQuery({
		...values,
		schmidtNumber: values['schmidt-number'],
		json: undefined,
		help: undefined
	} as Record<string, string | undefined>);
	const plan = planExperiment(request);
	process.stdout.write((values.json ? JSON.stringify(plan) : readablePlan(plan)) + '\n');
	return 0;
}

/** A zod issue as the option it concerns: "--schmidt-number: must not exceed the dimension". */
function messageOf(error: unknown): string {
	if (!(error instanceof ZodError)) return (error as Error).message.split('\n')[0];
	const issue = error.issues[0];
	const field = String(issue.path[0] ?? '').replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`);
	return `--${field}: ${issue.message}`;
}

try {
	process.exitCode = run(process.argv.slice(2));
} catch (error) {
	const badInput =
		error instanceof InputError ||
		error instanceof ZodError ||
		(error as { code?: string }).code?.startsWith('ERR_PARSE_ARGS');
	process.stderr.write(`rankseal: ${messageOf(error)}${badInput ? '' : ' (internal error)'}\n`);
	if (!badInput) process.stderr.write(`${USAGE.split('\n')[0]}\n`);
	process.exitCode = badInput ? 2 : 1;
}
