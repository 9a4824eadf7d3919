/**
 * What a claim, a claim listing and a check request may contain: validated with zod at every
 * boundary (forms, API bodies) and shared with the browser for early, plain-worded errors.
 */
import { textRule } from '$lib/text-rules';
import { z } from 'zod';
import { DEFAULT_FOURIER, FOURIER_CONVENTIONS, fourierProblem, METHOD_IDS } from '$lib/certify';
import { blankToUndefined, wholeNumber, type ValueSource } from '$lib/schema-numbers';
import {
	MANUSCRIPT_REFERENCE_MAX_LENGTH,
	MAX_DIMENSION,
	MIN_DIMENSION,
	SOURCE_DESCRIPTION_MAX_LENGTH,
	TITLE_MAX_LENGTH
} from './claim-limits';
import {
	normalisedTarget,
	TARGET_METHOD,
	targetField,
	targetFromField,
	declaredOf,
	targetProblem
} from './target';
import { basesField, basesProblem, defaultBasesFor, sentence } from './bases-fields';
import { probabilitiesField, TRIALS_MODES, trialsProblem } from './trials-fields';

export { CLAIM_STATES } from './states';
export { TRIALS_MODES } from './trials-fields';
export { defaultBasesFor } from './bases-fields';
/** Every method a claim may name: the bootstrap witness families and the declared-target check. */
export const CLAIM_METHODS = [...METHOD_IDS, TARGET_METHOD] as const;
export type { ClaimMethod } from './target';
export const CLAIM_SORTS = [
	'createdAt',
	'title',
	'dimension',
	'claimedSchmidtNumber',
	'state',
	'updatedAt'
] as const;

/** A whole number a claim needs: blank or missing reads as "not given", not as 0 (too small). */
const requiredWholeNumber = (
	label: string,
	missing: string,
	min: number,
	max: number,
	source: ValueSource
) =>
	z.preprocess(
		(value, ctx) => {
			const blank = value == null || (typeof value === 'string' && value.trim() === '');
			if (blank) ctx.addIssue({ code: 'custom', message: missing, input: value });
			return value;
		},
		wholeNumber(label, min, max, source)
	);

/** The fields that describe a claim: set when it is made, correctable until its first check. */
export const CLAIM_FIELDS = [
	'title',
	'sourceDescription',
	'dimension',
	'method',
	'bases',
	'fourier',
	'claimedSchmidtNumber',
	'manuscriptReference'
] as const;

const titleField = z
	.string({ error: 'Give the claim a title.' })
	.trim()
	.min(1, 'Give the claim a title.')
	.max(TITLE_MAX_LENGTH, `Keep the title under ${TITLE_MAX_LENGTH} characters.`)
	.superRefine(textRule('The title', 'line'));

const sourceDescriptionField = z
	.string({ error: 'Describe the source.' })
	.trim()
	.min(1, 'Describe the source.')
	.max(
		SOURCE_DESCRIPTION_MAX_LENGTH,
		`Keep the source description under ${SOURCE_DESCRIPTION_MAX_LENGTH} characters.`
	)
	.superRefine(textRule('The source description', 'lines'));

const manuscriptReferenceField = z
	.string()
	.trim()
	.max(
		MANUSCRIPT_REFERENCE_MAX_LENGTH,
		`Keep the manuscript reference under ${MANUSCRIPT_REFERENCE_MAX_LENGTH} characters.`
	)
	.superRefine(textRule('The manuscript reference', 'line'))
	.nullish()
	.transform((value) => value || null);

const fourierField = z.preprocess(
	blankToUndefined,
	z
		.enum(FOURIER_CONVENTIONS, {
			error: `The Fourier convention must be ${FOURIER_CONVENTIONS.join(' or ')}.`
		})
		.optional()
);

const trialsModeField = z.preprocess(
	blankToUndefined,
	z.enum(TRIALS_MODES, { error: 'The trials mode must be trials or blocks.' }).nullish()
);

/** The fields of a claim, in the order their problems are reported. */
const claimFields = (source: ValueSource) => ({
	groupId: z.preprocess(blankToUndefined, z.string().max(100).optional()),
	title: titleField,
	sourceDescription: sourceDescriptionField,
	dimension: requiredWholeNumber(
		'The dimension',
		'Give the local dimension d.',
		MIN_DIMENSION,
		MAX_DIMENSION,
		source
	),
	method: z.enum(CLAIM_METHODS, { error: `Choose a method: ${CLAIM_METHODS.join(', ')}.` }),
	bases: basesField(source),
	fourier: fourierField,
	claimedSchmidtNumber: requiredWholeNumber(
		'The claimed Schmidt number',
		'Give the claimed Schmidt number.',
		1,
		MAX_DIMENSION,
		source
	),
	manuscriptReference: manuscriptReferenceField,
	trialsMode: trialsModeField,
	trialsProbabilities: probabilitiesField,
	target: targetField,
	targetDeclared: targetField,
	targetFrom: targetFromField
});

type ClaimFields = z.output<z.ZodObject<ReturnType<typeof claimFields>>>;

/** What no single field can say: the claimed number within d, and bases the method may use in d. */
function claimProblems(claim: ClaimFields, ctx: z.RefinementCtx): void {
	trialsProblem(claim, ctx);
	targetProblem(claim, ctx);
	const d = claim.dimension;
	if (claim.claimedSchmidtNumber > d) {
		ctx.addIssue({
			code: 'custom',
			path: ['claimedSchmidtNumber'],
			message: `The claimed Schmidt number cannot exceed the dimension (${d}).`
		});
	}
	const fourier = claim.fourier ?? DEFAULT_FOURIER;
	const problem = fourierProblem(d, fourier);
	if (problem) {
		ctx.addIssue({ code: 'custom', path: ['fourier'], message: sentence(problem) });
		return;
	}
	if (claim.bases) basesProblem(claim.method, claim.bases, d, fourier, ctx);
}

/** A claim as a form (text, read as numbers) or a JSON body (numbers as sent) gives it. */
const claimInput = (source: ValueSource) =>
	z
		.object(claimFields(source))
		.superRefine(claimProblems)
		.transform((claim) => ({
			...claim,
			bases: claim.bases ?? defaultBasesFor(claim.method, claim.dimension),
			fourier: claim.fourier ?? DEFAULT_FOURIER,
			trialsMode: claim.trialsMode ?? null,
			trialsProbabilities: claim.trialsMode ? (claim.trialsProbabilities ?? null) : null,
			...targetColumns(claim.target, claim.targetDeclared),
			targetSource: claim.method === TARGET_METHOD ? (claim.targetFrom ?? 'declared') : null
		}));

/** The stored target: λ with Σλ² = 1, and the declared λ when we scaled it (null otherwise). */
function targetColumns(lambda: number[] | undefined, declared: number[] | undefined) {
	if (!lambda) return { target: null, targetDeclared: null };
	const { target, scaled } = normalisedTarget(lambda);
	return { target, targetDeclared: scaled ? lambda : declaredOf(target, declared) };
}

export const claimInputSchema = claimInput('form');
/** The API's claim body: the same rules, numbers only as JSON numbers. */
export const claimJsonSchema = claimInput('json');

/** A valid claim, with its bases filled in. */
export type ClaimInput = z.output<typeof claimInputSchema>;
/** What a form or an API body may send before validation. */
export type ClaimInputValues = z.input<typeof claimInputSchema>;

export {
	checkRequestJsonSchema,
	checkRequestSchema,
	checkRequestSchemaFor,
	type CheckRequest
} from './check-request';
