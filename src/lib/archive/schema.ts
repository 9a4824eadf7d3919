/** The group archive's filters, as they appear in the address, the API query and the export. */
import { z } from 'zod';
import { blankToUndefined } from '$lib/schema-numbers';
import { MAX_DIMENSION, MIN_DIMENSION } from '$lib/claims/claim-limits';
import { claimFilterFields } from '$lib/claims/filter';

const day = (label: string) =>
	z.preprocess(
		blankToUndefined,
		z
			.string()
			.regex(/^\d{4}-\d{2}-\d{2}$/, `${label} must be a date written YYYY-MM-DD.`)
			.refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)), `${label} is not a real date.`)
			.optional()
	);

export const archiveFilterSchema = z
	.object({
		group: z.preprocess(blankToUndefined, z.string().max(100).optional()),
		...claimFilterFields,
		dimension: z.preprocess(
			blankToUndefined,
			z.coerce
				.number({ error: 'Dimension must be a number.' })
				.int('Dimension must be a whole number.')
				.min(MIN_DIMENSION, `Dimension must be at least ${MIN_DIMENSION}.`)
				.max(MAX_DIMENSION, `Dimension must be at most ${MAX_DIMENSION}.`)
				.optional()
		),
		from: day('From'),
		to: day('To')
	})
	.refine((f) => !f.from || !f.to || f.from <= f.to, {
		message: 'From must not be later than To.',
		path: ['to']
	});

export type ArchiveFilter = z.output<typeof archiveFilterSchema>;

export const ARCHIVE_FORMATS = ['csv', 'json'] as const;
