/**
 * What a claim, a claim listing and a check request may contain: validated with zod at every
 * boundary (forms, API bodies) and shared with the browser for early, plain-worded errors.
 */
import { textRule } from '$lib/text-rules';
import { z } from 'zod';
import {
	availableBases,
	CELL_RESAMPLES_BUDGET,
	CONFIDENCE,
	DEFAULT_FOURIER,
	FOURIER_CONVENTIONS,
	fourierProblem,
	METHOD_IDS,
	RESAMPLES,
	resamplesCeiling,
	witnessFamilies,
	type FourierConvention
} from '$lib/certify';
import { basisProblem } from '$lib/certify/bases';
import { MAX_SEED } from '$lib/certify/poisson';
import {
	blankToUndefined,
	booleanFrom,
	numberFrom,
	wholeNumber,
	type ValueSource
} from '$lib/schema-numbers';
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
	targetProblem,
	type ClaimMethod
} from './target';

export { CLAIM_STATES } from './states';
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

/** Forms: "0,1,2", "0 1" or ["0", "1"]; JSON: [0, 1] only. Empty → undefined (the default). */
const basesField = (source: ValueSource) =>
	z.preprocess(
		(value) => {
			if (source === 'form' && typeof value === 'string')
				value = value.split(/[\s,]+/).filter((part) => part !== '');
			if (Array.isArray(value)) return value.length ? value : undefined;
			return value;
		},
		z
			.array(wholeNumber('Each basis', 0, MAX_DIMENSION, source), {
				error: 'Bases must be a list of basis numbers.'
			})
			.optional()
	);

/** Forms: "0.5, 0.5"; JSON: [0.5, 0.5]. Empty → undefined (uniform). */
const probabilitiesField = z.preprocess(
	(value) => {
		if (typeof value === 'string') value = value.split(/[\s,]+/).filter((part) => part !== '');
		if (Array.isArray(value)) return value.length ? value.map((v) => Number(v)) : undefined;
		// null: what a validated claim carries for "uniform", so it parses again unchanged.
		return value ?? undefined;
	},
	z
		.array(
			z
				.number({ error: 'Each setting probability must be a number.' })
				.gt(0, 'Each setting probability must lie above 0.')
				.max(1, 'Each setting probability must be at most 1.'),
			{ error: 'Setting probabilities must be a list of numbers.' }
		)
		.optional()
);

/** An engine message as a sentence for a form: capital first letter, full stop. */
const sentence = (reason: string) => reason.charAt(0).toUpperCase() + reason.slice(1) + '.';

/** The bases a method uses when a claim names none: 0 and 1 exist in every dimension. */
export function defaultBasesFor(method: ClaimMethod, dimension: number): number[] {
	if (method === TARGET_METHOD) return [0, 1];
	return witnessFamilies[method].defaultBases([0, 1], dimension);
}

/** Time-ordered trials: one bet per coincidence, or one per block of one setting. */
export const TRIALS_MODES = ['trials', 'blocks'] as const;
const TRIALS_METHODS: readonly string[] = ['mub-correlation', 'steering-2mub'];

/** Probabilities need a trials mode, one per basis, summing to 1; the mode needs a sum method. */
function trialsProblem(
	claim: {
		trialsMode?: string | null;
		trialsProbabilities?: number[];
		method: string;
		bases?: number[];
	},
	ctx: z.RefinementCtx
) {
	const issue = (path: string, message: string) =>
		ctx.addIssue({ code: 'custom', path: [path], message });
	const pi = claim.trialsProbabilities;
	if (!claim.trialsMode) {
		if (pi)
			issue('trialsProbabilities', 'Setting probabilities need a trials mode (trials or blocks).');
		return;
	}
	if (!TRIALS_METHODS.includes(claim.method))
		issue('method', `Time-ordered trials work with ${TRIALS_METHODS.join(' or ')}.`);
	if (!pi) return;
	if (claim.bases && pi.length !== claim.bases.length)
		issue('trialsProbabilities', `Give one setting probability per basis (${claim.bases.length}).`);
	const sum = pi.reduce((s, p) => s + p, 0);
	if (Math.abs(sum - 1) > 1e-9)
		issue('trialsProbabilities', `The setting probabilities must sum to 1 (they sum to ${sum}).`);
}

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

/** Bases that do not exist in dimension d under this convention, or that the method cannot use. */
function basesProblem(
	method: ClaimMethod,
	bases: number[],
	d: number,
	fourier: FourierConvention,
	ctx: z.RefinementCtx
): void {
	const available = availableBases(d, fourier);
	const missing = bases.filter((b) => !available.includes(b));
	if (missing.length) {
		const reason = basisProblem(d, missing[0], fourier) ?? '';
		ctx.addIssue({
			code: 'custom',
			path: ['bases'],
			message: `${sentence(reason)} Available with fourier=${fourier}: ${available.join(', ')}.`
		});
		return;
	}
	try {
		if (method === TARGET_METHOD) {
			if (bases.join() !== '0,1')
				throw new RangeError('fidelity-target uses bases 0,1 (computational, then tilted)');
		} else witnessFamilies[method].checkBases(bases, d, fourier);
	} catch (error) {
		ctx.addIssue({ code: 'custom', path: ['bases'], message: sentence((error as Error).message) });
	}
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
