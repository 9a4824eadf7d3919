/**
 * What a check request may contain (forms and API bodies), and its resamples ceiling for a
 * claim of a given size when accidentals are subtracted.
 */
import { z } from 'zod';
import { CELL_RESAMPLES_BUDGET, CONFIDENCE, RESAMPLES, resamplesCeiling } from '$lib/certify';
import { MAX_SEED } from '$lib/certify/poisson';
import {
	blankToUndefined,
	booleanFrom,
	numberFrom,
	wholeNumber,
	type ValueSource
} from '$lib/schema-numbers';

const confidenceRange = `Confidence must lie strictly between ${CONFIDENCE.above} and ${CONFIDENCE.below}.`;

/** A form's text is trimmed to "not given"; a JSON body leaves a field out instead. */
const optionalFrom = <T extends z.ZodType>(schema: T, source: ValueSource) =>
	source === 'form' ? z.preprocess(blankToUndefined, schema.optional()) : schema.optional();

const checkRequest = (source: ValueSource) =>
	z.object({
		datasetId: z.preprocess(blankToUndefined, z.string().max(100).optional()),
		resamples: optionalFrom(wholeNumber('Resamples', RESAMPLES.min, RESAMPLES.max, source), source),
		confidence: optionalFrom(
			numberFrom('Confidence', source)
				.gt(CONFIDENCE.above, confidenceRange)
				.lt(CONFIDENCE.below, confidenceRange),
			source
		),
		seed: optionalFrom(wholeNumber('The seed', 1, MAX_SEED, source), source),
		subtractAccidentals: booleanFrom('subtractAccidentals', source).optional()
	});

export const checkRequestSchema = checkRequest('form');
/** The API's check body: numbers and booleans only as JSON sends them. */
export const checkRequestJsonSchema = checkRequest('json');

export type CheckRequest = z.output<typeof checkRequestSchema>;

/**
 * The check request for a claim of this size: with accidentals subtracted (per-cell draws) the
 * resamples also stay within the cells × resamples budget. Raw counts have no such ceiling; rates
 * (known only from the file) are held to it by the engine.
 */
export function checkRequestSchemaFor(claim: { dimension: number; bases: number[] }) {
	return checkRequestSchema.superRefine((request, ctx) => {
		if (!request.subtractAccidentals) return;
		const ceiling = resamplesCeiling(claim.dimension, claim.bases.length);
		if (request.resamples === undefined || request.resamples <= ceiling) return;
		ctx.addIssue({
			code: 'custom',
			path: ['resamples'],
			message: `Resamples must be at most ${ceiling.toLocaleString('en')} for d = ${claim.dimension} on ${claim.bases.length} bases (cells × resamples ≤ ${CELL_RESAMPLES_BUDGET.toLocaleString('en')}).`
		});
	});
}
