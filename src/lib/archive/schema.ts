/** The group archive's filters, as they appear in the address, the API query and the export. */
import { z } from 'zod';
import { CLAIM_METHODS, CLAIM_STATES } from '$lib/claims/schema';

const blankToUndefined = (value: unknown) =>
	typeof value === 'string' && value.trim() === '' ? undefined : value;

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
		q: z.preprocess(blankToUndefined, z.string().trim().max(200).optional()),
		state: z.preprocess(
			blankToUndefined,
			z.enum(CLAIM_STATES, { error: `State must be one of ${CLAIM_STATES.join(', ')}.` }).optional()
		),
		method: z.preprocess(
			blankToUndefined,
			z
				.enum(CLAIM_METHODS, { error: `Method must be one of ${CLAIM_METHODS.join(', ')}.` })
				.optional()
		),
		dimension: z.preprocess(
			blankToUndefined,
			z.coerce
				.number({ error: 'Dimension must be a number.' })
				.int('Dimension must be a whole number.')
				.min(2, 'Dimension must be at least 2.')
				.max(1024, 'Dimension must be at most 1024.')
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
