/**
 * The API's request bodies, generated from the zod schemas the routes parse with (z.toJSONSchema,
 * as the client sends them: io 'input'), so the document cannot drift from what is accepted.
 * Only the descriptions are written here.
 */
import { z } from 'zod';
import {
	CELL_RESAMPLES_BUDGET,
	DEFAULT_FOURIER,
	DEFAULTS,
	FOURIER_CONVENTIONS
} from '$lib/certify';
import { issueJsonSchema, withdrawJsonSchema } from '$lib/claims/api-bodies';
import { checkRequestJsonSchema, claimJsonSchema } from '$lib/claims/schema';
import { refereeCheckJsonSchema } from '$lib/server/review/referee';
import { reportJsonSchema } from '$lib/server/review/reports';
import { REVIEW_LINK_DEFAULT_DAYS, reviewLinkJsonSchema } from '$lib/server/review/review-links';
import { shareInputSchema } from '$lib/server/review/shares';
import { TOKEN_DEFAULT_DAYS, tokenJsonSchema } from '$lib/server/accounts/tokens';

type JsonSchema = { properties?: Record<string, Record<string, unknown>>; [key: string]: unknown };

/** The JSON Schema of what `schema` accepts, with a description per property (and defaults). */
export function bodyFromZod(
	schema: z.ZodType,
	notes: Record<string, Record<string, unknown>> = {},
	description?: string
): JsonSchema {
	const generated = z.toJSONSchema(schema, {
		io: 'input',
		target: 'draft-2020-12',
		unrepresentable: 'any'
	}) as JsonSchema;
	delete generated.$schema;
	for (const [name, note] of Object.entries(notes)) {
		const property = generated.properties?.[name];
		if (!property) throw new Error(`No property ${name} in the schema a note describes`);
		Object.assign(property, note);
	}
	return description ? { description, ...generated } : generated;
}

const fourierNote =
	'Which Fourier basis basis 1 is: cyclic (the Z_d transform, every d) or field (the GF(p^s) basis and its d + 1 MUBs, prime powers only). For prime d they are the same bases.';

const claimNotes = {
	groupId: { description: 'Default: the caller’s first group.' },
	dimension: { description: 'Local dimension d.' },
	bases: {
		description:
			'Basis indices the method uses; they must exist in dimension d under the Fourier convention (bases above 1 in d = p^s, s ≥ 2 need field). Default: [0, 1].'
	},
	fourier: {
		description: `${fourierNote} One of ${FOURIER_CONVENTIONS.join(', ')}.`,
		default: DEFAULT_FOURIER
	},
	claimedSchmidtNumber: { description: 'At most the dimension.' },
	trialsMode: {
		description:
			'Time-ordered trials (mub-correlation or steering-2mub): uploads are trials CSV (plain or gzip) and checks are test supermartingales. Set only when the claim is made.'
	},
	trialsProbabilities: {
		description: 'Setting probabilities, one per basis, summing to 1. Default: uniform.'
	},
	targetFrom: {
		description:
			'fidelity-target only: "declared" (default; give target) or "calibration-run" (give no target; upload the run with POST /api/v1/claims/{id}/target-run before the first check, which fits λ on it and freezes it).'
	},
	target: {
		description:
			'fidelity-target only, and required there unless targetFrom is calibration-run: the target’s Schmidt coefficients λ, d positive numbers, not increasing, declared before the data (never fitted on the counts). Σλ² = 1 within 1e-6 is kept as sent; any other scale is scaled to Σλ² = 1 and the claim keeps the declared values (target.declared).'
	}
};

const checkNotes = {
	datasetId: { description: 'Default: the claim’s newest dataset.' },
	resamples: {
		default: DEFAULTS.resamples,
		description: `Also at most ${CELL_RESAMPLES_BUDGET} ÷ (d² × number of bases) for the claim (cells × resamples); 400 naming the ceiling otherwise.`
	},
	confidence: { default: DEFAULTS.confidence },
	seed: {
		description:
			'Omitted: derived from the SHA-256 of the canonical counts and the settings (the same analysis gives the same numbers). A chosen seed other than that one counts as another analysis of these counts.'
	},
	subtractAccidentals: {
		default: false,
		description:
			'Subtract the file’s accidentals column before normalising; the result is labelled background-subtracted. 400 when the dataset has no accidentals column.'
	}
};

/** OpenAPI components: every JSON request body the API parses. */
export const requestSchemas = {
	ClaimInput: bodyFromZod(claimJsonSchema, claimNotes),
	CheckRequest: bodyFromZod(checkRequestJsonSchema, checkNotes),
	TokenInput: bodyFromZod(tokenJsonSchema, {
		expiresInDays: {
			default: TOKEN_DEFAULT_DAYS,
			description: 'Days until the token is refused, or "never".'
		}
	}),
	ShareInput: bodyFromZod(shareInputSchema),
	ReviewLinkInput: bodyFromZod(reviewLinkJsonSchema, {
		label: { description: 'Private: authors never see it.' },
		expiresInDays: { default: REVIEW_LINK_DEFAULT_DAYS }
	}),
	ReRunInput: bodyFromZod(refereeCheckJsonSchema, {
		seed: { description: 'Blank: the recorded seed.' }
	}),
	ReportInput: bodyFromZod(reportJsonSchema),
	CertificateRequest: bodyFromZod(issueJsonSchema, {}, 'The finished check to certify.'),
	WithdrawInput: bodyFromZod(withdrawJsonSchema, {
		reason: { description: 'Why the claim is withdrawn: shown on its public verification page.' }
	})
};
