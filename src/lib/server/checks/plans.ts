/**
 * The planner for anyone (no account needed): a plan from query parameters, simulated counts only
 * within the web server's cost cap, answers kept for repeated questions, and a rate limit on the
 * questions that cost simulations.
 */
import { InputError } from '$lib/certify';
import { SIMULATION_COST_CAP } from '$lib/certify/planner/check-counts';
import { planExperiment, type ExperimentPlan } from '$lib/certify/planner/plan-experiment';
import { parsePlanQuery } from '$lib/certify/planner/query';
import { takeOrRefuse } from '../core/rate-limits';
import { FieldError } from '../core/field-error';
import { planTarget, type TargetPlan } from '$lib/certify/planner/plan-target';
import { parseTargetPlanQuery } from '$lib/certify/planner/target-query';

/** Answers kept (oldest dropped first): a plan is a pure function of its question. */
const KEPT = 200;
const kept = new Map<string, ExperimentPlan>();
const keptTarget = new Map<string, TargetPlan>();

/** fidelity-target with its declared λ (planner/plan-target.ts): exact limits, cheap to simulate. */
async function targetPlanFor(values: Record<string, string | undefined>, address: string) {
	const request = parseTargetPlanQuery(values);
	const key = JSON.stringify(request);
	const known = keptTarget.get(key);
	if (known) return known;
	await takeOrRefuse(
		'planSimulations',
		address,
		'Too many plans with simulated counts from this address.'
	);
	let plan: TargetPlan;
	try {
		plan = planTarget(request);
	} catch (error) {
		if (error instanceof InputError) throw new FieldError('target', error.message);
		throw error;
	}
	keptTarget.set(key, plan);
	if (keptTarget.size > KEPT) keptTarget.delete(keptTarget.keys().next().value!);
	return plan;
}

/** The planner of the API and the /plan page: fidelity-target (with `target`) or a witness family. */
export async function planFor(
	values: Record<string, string | undefined>,
	address: string
): Promise<ExperimentPlan | TargetPlan> {
	if (values.method === 'fidelity-target') return targetPlanFor(values, address);
	return planWitnessFor(values, address);
}

/** The witness families' planner. */
export async function planWitnessFor(
	values: Record<string, string | undefined>,
	address: string
): Promise<ExperimentPlan> {
	const request = parsePlanQuery(values);
	const key = JSON.stringify(request);
	const known = kept.get(key);
	if (known) return known;
	if (request.simulate !== 'none')
		await takeOrRefuse(
			'planSimulations',
			address,
			'Too many plans with simulated counts from this address.'
		);
	let plan: ExperimentPlan;
	try {
		plan = planExperiment({ ...request, costCap: SIMULATION_COST_CAP });
	} catch (error) {
		// The only question the schema cannot answer alone: whether the bases suit the method.
		if (error instanceof InputError)
			throw new FieldError('bases', error.message.replace(/^bases: /, ''));
		throw error;
	}
	kept.set(key, plan);
	if (kept.size > KEPT) kept.delete(kept.keys().next().value!);
	return plan;
}
