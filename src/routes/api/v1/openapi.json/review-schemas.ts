/** JSON Schemas of sharing, review links and reports (issue 9), beside review-paths.ts. */
import { RECOMMENDATIONS } from '$lib/server/db/models/Report';

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const text = { type: 'string' };
const timestamp = { type: 'string', format: 'date-time' };
const nullable = (schema: object) => ({ anyOf: [schema, { type: 'null' }] });

export const reviewSchemas = {
	Share: {
		type: 'object',
		required: ['id', 'claimId', 'editorEmail', 'journal', 'manuscript', 'opened', 'createdAt'],
		properties: {
			...{ id: text, claimId: text, editorEmail: text, journal: text, manuscript: text },
			...{ opened: { type: 'boolean' }, createdAt: timestamp, withdrawnAt: nullable(timestamp) }
		}
	},
	CreatedReviewLink: {
		type: 'object',
		required: ['id', 'url', 'expiresAt'],
		properties: { id: text, url: text, expiresAt: timestamp }
	},
	ReviewLink: {
		type: 'object',
		required: ['id', 'claimId', 'state', 'expiresAt', 'createdAt'],
		properties: {
			...{ id: text, claimId: text, label: nullable(text) },
			state: { type: 'string', enum: ['active', 'expired', 'revoked'] },
			...{ expiresAt: timestamp, createdAt: timestamp }
		}
	},
	QueuedCheck: {
		type: 'object',
		required: ['id', 'status'],
		properties: { id: text, status: ref('CheckStatus') }
	},
	ReRun: {
		allOf: [
			ref('Check'),
			{
				type: 'object',
				required: ['comparison'],
				properties: {
					comparison: {
						type: 'object',
						properties: {
							sameSeed: { type: 'boolean' },
							identical: nullable({ type: 'boolean' }),
							withinError: nullable({ type: 'boolean' }),
							firstDifference: nullable(text),
							engines: nullable({
								type: 'object',
								required: ['certified', 'rerun'],
								properties: { certified: text, rerun: text },
								description:
									'The certificate’s and the re-run’s engine versions when they differ; null when the same.'
							})
						}
					}
				}
			}
		]
	},
	Review: {
		type: 'object',
		required: [
			'claim',
			'certificate',
			'newerCertificate',
			'certified',
			'dataset',
			'tables',
			'checks',
			'report'
		],
		properties: {
			claim: { type: 'object' },
			certificate: {
				...ref('Certificate'),
				description: 'The certificate under review: the one current when the link was made.'
			},
			newerCertificate: {
				...nullable(ref('Certificate')),
				description: 'A certificate issued for the claim since the link was made, if any.'
			},
			certified: ref('Check'),
			dataset: { type: 'object' },
			tables: { type: 'array', items: { type: 'object' } },
			checks: { type: 'array', items: ref('ReRun') },
			report: nullable(ref('Report'))
		}
	},
	Report: {
		type: 'object',
		required: ['id', 'claimId', 'recommendation', 'comments', 'state'],
		properties: {
			...{ id: text, claimId: text, comments: text },
			recommendation: { type: 'string', enum: RECOMMENDATIONS },
			state: { type: 'string', enum: ['draft', 'submitted', 'released'] },
			...{ submittedAt: nullable(timestamp), releasedAt: nullable(timestamp) }
		}
	}
};
