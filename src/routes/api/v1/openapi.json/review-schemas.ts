/** JSON Schemas of sharing, review links and reports (issue 9), beside review-paths.ts. */
import { RECOMMENDATIONS } from '$lib/server/db/models/Report';
import { REVIEW_LINK_DEFAULT_DAYS, REVIEW_LINK_MAX_DAYS } from '$lib/server/review/review-links';

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const text = { type: 'string' };
const timestamp = { type: 'string', format: 'date-time' };
const nullable = (schema: object) => ({ anyOf: [schema, { type: 'null' }] });

export const reviewSchemas = {
	ShareInput: {
		type: 'object',
		required: ['email', 'journal', 'manuscript'],
		properties: { email: { type: 'string', format: 'email' }, journal: text, manuscript: text }
	},
	Share: {
		type: 'object',
		required: ['id', 'claimId', 'editorEmail', 'journal', 'manuscript', 'opened', 'createdAt'],
		properties: {
			...{ id: text, claimId: text, editorEmail: text, journal: text, manuscript: text },
			...{ opened: { type: 'boolean' }, createdAt: timestamp, withdrawnAt: nullable(timestamp) }
		}
	},
	ReviewLinkInput: {
		type: 'object',
		properties: {
			label: { type: 'string', maxLength: 200, description: 'Private: authors never see it.' },
			expiresInDays: {
				type: 'integer',
				minimum: 1,
				maximum: REVIEW_LINK_MAX_DAYS,
				default: REVIEW_LINK_DEFAULT_DAYS
			}
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
	ReRunInput: {
		type: 'object',
		properties: { seed: { type: 'integer', minimum: 1, description: 'Blank: the recorded seed.' } }
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
							firstDifference: nullable(text)
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
	ReportInput: {
		type: 'object',
		required: ['recommendation', 'comments'],
		properties: {
			recommendation: { type: 'string', enum: RECOMMENDATIONS },
			comments: { type: 'string', maxLength: 50_000 },
			submit: { type: 'boolean', default: true }
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
