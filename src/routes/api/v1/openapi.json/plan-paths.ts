/** The planner's endpoint of the OpenAPI document (public, no sign-in), with its schemas. */
import { MAX_DIMENSION, METHOD_IDS, MIN_DIMENSION } from '$lib/certify';
import { SIMULATE_CHOICES } from '$lib/certify/planner/query';

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const query = (name: string, required: boolean, schema: object, description: string) => ({
	name,
	in: 'query',
	required,
	description,
	schema
});
const nullableNumber = { type: ['number', 'null'] };

export const planPaths = {
	'/api/v1/plan': {
		get: {
			operationId: 'planMeasurement',
			summary:
				'What it takes to certify Schmidt number k: critical visibilities and counts per basis for 90 % power, simulated with the engine (public, no sign-in)',
			security: [],
			parameters: [
				query(
					'method',
					true,
					{ type: 'string', enum: [...METHOD_IDS, 'fidelity-target'] },
					'The witness family, or fidelity-target (then `target` is required and `dimension` is its length).'
				),
				query(
					'checkId',
					false,
					{ type: 'string' },
					'A finished check as the model (its own tables, proportions, bases and visibility); needs a caller who may read it (401 without one, 404 for a check out of sight). Then only `schmidtNumber` is read (default: the claim’s).'
				),
				query(
					'target',
					false,
					{ type: 'string', pattern: '^[0-9.eE+-]+(,[0-9.eE+-]+)+$' },
					'fidelity-target only: the declared Schmidt coefficients λ, not increasing (scaled to Σλ² = 1).'
				),
				query(
					'dimension',
					false,
					{ type: 'integer', minimum: MIN_DIMENSION, maximum: MAX_DIMENSION },
					'Local dimension d.'
				),
				query(
					'schmidtNumber',
					true,
					{ type: 'integer', minimum: 2 },
					'The Schmidt number k to certify (at most d).'
				),
				query(
					'visibility',
					true,
					{ type: 'number', minimum: 0, maximum: 1 },
					'White-noise visibility η of the source.'
				),
				query(
					'bases',
					false,
					{ type: 'string', pattern: '^(all|\\d+(,\\d+)*)$' },
					'Basis indices such as 0,1, or all (default: the method’s two).'
				),
				query(
					'confidence',
					false,
					{ type: 'number', exclusiveMinimum: 0.5, exclusiveMaximum: 1 },
					'One-sided confidence (default 0.99865).'
				),
				query(
					'simulate',
					false,
					{ type: 'string', enum: SIMULATE_CHOICES, default: 'requested' },
					'Which designs get simulated counts.'
				)
			],
			responses: {
				'200': {
					description: 'The plan.',
					content: {
						'application/json': {
							schema: { oneOf: [ref('Plan'), ref('TargetPlan'), ref('CheckPlan')] }
						}
					}
				},
				'400': {
					description: 'A missing or bad parameter, named in `field` (code bad_input).',
					content: { 'application/json': { schema: ref('Error') } }
				},
				'429': {
					description:
						'Too many plans with simulated counts from this address (code rate_limited).',
					content: { 'application/json': { schema: ref('Error') } }
				}
			}
		}
	}
};

const design = {
	type: 'object',
	required: [
		'method',
		'trust',
		'bases',
		'criticalVisibility',
		'countsPerBasis',
		'totalCounts',
		'power',
		'note'
	],
	properties: {
		method: { type: 'string', enum: METHOD_IDS },
		trust: { type: 'string' },
		bases: { type: 'array', items: { type: 'integer' } },
		criticalVisibility: { type: 'number' },
		countsPerBasis: nullableNumber,
		totalCounts: nullableNumber,
		power: nullableNumber,
		note: { type: ['string', 'null'] }
	}
};

export const planSchemas = {
	PlanDesign: design,
	CheckPlan: {
		type: 'object',
		description:
			'A finished check as the model: its rungs, its effective visibility, and the counts for 90 % power at Schmidt number k simulated from its own tables (the advice stored after the check for the claim’s own k).',
		required: [
			'model',
			'checkId',
			'schmidtNumber',
			'rungs',
			'criticalVisibility',
			'counts',
			'note'
		],
		properties: {
			model: { type: 'string', enum: ['check'] },
			checkId: { type: 'string' },
			method: { type: 'string' },
			dimension: { type: 'integer' },
			bases: { type: 'array', items: { type: 'integer' } },
			schmidtNumber: { type: 'integer' },
			visibility: { type: 'number' },
			criticalVisibility: { type: 'number' },
			rungs: { type: 'array', items: { type: 'object' } },
			counts: { type: ['object', 'null'] },
			note: { type: ['string', 'null'] }
		}
	},
	TargetPlan: {
		type: 'object',
		description:
			'fidelity-target: the rungs Σ_{i≤r} λ_i² with their critical visibilities, and the computational pairs (tilted table at the same integration time) for 90 % power, simulated with the exact-limit check.',
		required: [
			'request',
			'rungs',
			'criticalVisibility',
			'pairsNeeded',
			'power',
			'note',
			'simulation'
		],
		properties: {
			request: { type: 'object' },
			rungs: { type: 'array', items: { type: 'object' } },
			criticalVisibility: { type: 'number' },
			pairsNeeded: { type: ['integer', 'null'] },
			power: { type: ['number', 'null'] },
			note: { type: ['string', 'null'] },
			simulation: { type: 'object' }
		}
	},
	Plan: {
		type: 'object',
		required: ['request', 'rungs', 'design', 'alternatives', 'curve', 'simulation'],
		properties: {
			request: { type: 'object' },
			rungs: {
				type: 'array',
				items: {
					type: 'object',
					properties: {
						upToSchmidtNumber: { type: 'integer' },
						bound: { type: 'number' },
						criticalVisibility: { type: 'number' }
					}
				}
			},
			design: ref('PlanDesign'),
			alternatives: { type: 'array', items: ref('PlanDesign') },
			curve: {
				type: 'array',
				items: {
					type: 'object',
					properties: { dimension: { type: 'integer' }, criticalVisibility: { type: 'number' } }
				}
			},
			simulation: {
				type: 'object',
				properties: {
					experiments: { type: 'integer' },
					resamples: { type: 'integer' },
					seed: { type: 'integer' },
					target: { type: 'number' },
					engine: { type: 'string' }
				}
			}
		}
	}
};
