/** The OpenAPI paths of sharing, review links and reports (issue 9); schemas in review-schemas.ts. */

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const body = (name: string) => ({ 'application/json': { schema: ref(name) } });
const reply = (description: string, name: string) => ({ description, content: body(name) });
const failure = (description: string) => reply(description, 'Error');
const pathParameter = (name: string, description: string) => ({
	name,
	in: 'path',
	required: true,
	description,
	schema: { type: 'string' }
});
const id = (what: string) => pathParameter('id', `The ${what}’s id.`);
const token = pathParameter('token', 'The review link’s token (rvw_…), the last part of its URL.');
const checkId = pathParameter('checkId', 'A re-run started through this link.');

const unauthorised = failure('Neither a session cookie nor a valid bearer token.');
const notFound = failure('No such thing among those the caller may see.');
const badRequest = failure(
	'The body fails validation (code bad_input); the message names the fields.'
);
const forbidden = failure('Visible to the caller, but not theirs to do (code forbidden).');
const conflict = failure('Not in a state that allows it (code conflict).');
const invalidLink = failure(
	'The link is unknown, mistyped, expired or revoked, or its share was withdrawn: one answer for all.'
);
const referee = { security: [], parameters: [token] };

export const reviewPaths = {
	'/api/v1/claims/{id}/shares': {
		get: {
			operationId: 'listShares',
			summary: 'The claim’s shares with editors (members of its group)',
			parameters: [id('claim')],
			responses: {
				'200': {
					description: 'Shares, newest first, withdrawn ones included.',
					content: {
						'application/json': {
							schema: {
								type: 'object',
								properties: { shares: { type: 'array', items: ref('Share') } }
							}
						}
					}
				},
				'401': unauthorised,
				'403': forbidden,
				'404': notFound
			}
		},
		post: {
			operationId: 'shareClaim',
			summary: 'Share a certified claim with a journal editor, who receives a notice',
			parameters: [id('claim')],
			requestBody: { required: true, content: body('ShareInput') },
			responses: {
				'201': reply('The share.', 'Share'),
				'400': badRequest,
				'401': unauthorised,
				'403': forbidden,
				'404': notFound,
				'409': conflict
			}
		}
	},
	'/api/v1/shares/{id}': {
		delete: {
			operationId: 'withdrawShare',
			summary: 'Withdraw a share; its review links stop working at once',
			parameters: [id('share')],
			responses: {
				'200': reply('The withdrawn share.', 'Share'),
				'401': unauthorised,
				'403': forbidden,
				'404': notFound
			}
		}
	},
	'/api/v1/claims/{id}/review-links': {
		post: {
			operationId: 'createReviewLink',
			summary: 'Make a review link for one referee (editors the claim is shared with)',
			parameters: [id('claim')],
			requestBody: { required: false, content: body('ReviewLinkInput') },
			responses: {
				'201': reply(
					'The link; its URL (with the token) is in this answer only.',
					'CreatedReviewLink'
				),
				'400': badRequest,
				'401': unauthorised,
				'403': forbidden,
				'404': notFound
			}
		}
	},
	'/api/v1/review-links/{id}': {
		delete: {
			operationId: 'revokeReviewLink',
			summary: 'Revoke a review link at once',
			parameters: [id('review link')],
			responses: {
				'200': reply('The revoked link.', 'ReviewLink'),
				'401': unauthorised,
				'403': forbidden,
				'404': notFound
			}
		}
	},
	'/api/v1/reports/{id}/release': {
		post: {
			operationId: 'releaseReport',
			summary: 'Release a filed report to the claim’s authors (the editor)',
			parameters: [id('report')],
			responses: {
				'200': reply('The released report.', 'Report'),
				'401': unauthorised,
				'403': forbidden,
				'404': notFound,
				'409': conflict
			}
		}
	},
	'/api/v1/review/{token}': {
		get: {
			...referee,
			operationId: 'readReview',
			summary:
				'What the referee sees: claim, certificate, certified check, counts tables, re-runs, report',
			responses: { '200': reply('The review.', 'Review'), '404': invalidLink }
		}
	},
	'/api/v1/review/{token}/checks': {
		post: {
			...referee,
			operationId: 'startReRun',
			summary: 'Re-run the certified check: {} for the recorded seed, { seed } for a fresh one',
			requestBody: { required: false, content: body('ReRunInput') },
			responses: {
				'202': reply('Queued; poll it.', 'QueuedCheck'),
				'400': badRequest,
				'404': invalidLink,
				'429': failure(
					'A re-run from this link is still queued or running (code rate_limited; one at a time per link); Retry-After the seconds to wait, or cancel it.'
				)
			}
		}
	},
	'/api/v1/review/{token}/checks/{checkId}': {
		get: {
			...referee,
			parameters: [token, checkId],
			operationId: 'readReRun',
			summary: 'A re-run: the shape of any check, and how it compares with the certificate',
			responses: { '200': reply('The re-run.', 'ReRun'), '404': invalidLink }
		},
		delete: {
			...referee,
			parameters: [token, checkId],
			operationId: 'cancelReRun',
			summary: 'Cancel a queued or running re-run of this link',
			responses: {
				'200': reply('The cancelled re-run.', 'ReRun'),
				'404': invalidLink,
				'409': failure('The re-run has ended already (code conflict).')
			}
		}
	},
	'/api/v1/review/{token}/report': {
		get: {
			...referee,
			operationId: 'readReport',
			summary: 'The referee’s own report (null before the first save)',
			responses: { '200': reply('{ report: Report | null }', 'OwnReport'), '404': invalidLink }
		},
		post: {
			...referee,
			operationId: 'saveReport',
			summary: 'Save the report as a draft (submit: false) or file it (then it is fixed)',
			requestBody: { required: true, content: body('ReportInput') },
			responses: {
				'200': reply('Saved as a draft.', 'Report'),
				'201': reply('Filed.', 'Report'),
				'400': badRequest,
				'404': invalidLink,
				'409': failure('The report has been filed already.')
			}
		}
	},
	'/api/v1/review/{token}/bundle': {
		get: {
			...referee,
			operationId: 'downloadReviewBundle',
			summary: 'The current certificate’s evidence bundle',
			responses: {
				'200': {
					description: 'The zip.',
					content: { 'application/zip': { schema: { type: 'string', format: 'binary' } } }
				},
				'404': invalidLink
			}
		}
	}
};
