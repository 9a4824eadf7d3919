/** The OpenAPI 3.1 description of /api/v1: exactly the endpoints under src/routes/api/v1. */
import { MAX_COUNTS_FILE_BYTES } from '$lib/certify';
import { CLAIM_METHODS, CLAIM_SORTS, CLAIM_STATES } from '$lib/claims/schema';
import { certificatePaths } from './certificate-paths';
import { citationPaths } from './citation-paths';
import { planPaths, planSchemas } from './plan-paths';
import { targetRunPaths } from './target-run-paths';
import { archiveSchemas } from './archive-schemas';
import { certificateSchemas } from './certificate-schemas';
import { reviewPaths } from './review-paths';
import { requestSchemas } from './request-bodies';
import { reviewSchemas } from './review-schemas';
import { schemas } from './schemas';

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const body = (name: string) => ({ 'application/json': { schema: ref(name) } });
const reply = (description: string, name: string) => ({ description, content: body(name) });
const failure = (description: string) => reply(description, 'Error');
const idParameter = (what: string) => ({
	name: 'id',
	in: 'path',
	required: true,
	description: `The ${what}’s id.`,
	schema: { type: 'string' }
});
const query = (name: string, schema: object, description: string) => ({
	name,
	in: 'query',
	required: false,
	description,
	schema
});

const unauthorised = failure('Neither a session cookie nor a valid bearer token.');
const notFound = failure(
	'No such thing in the caller’s groups (another group’s ids answer the same).'
);
const badRequest = failure(
	'The body or the query fails validation (code bad_input); the message names the fields.'
);
const forbidden = failure('Visible to the caller, but not theirs to do (code forbidden).');

export const openApiDocument = {
	openapi: '3.1.0',
	info: {
		title: 'Rankseal API',
		version: '1.0.0',
		description:
			'Claims, counts files, checks and certificates of the caller’s groups; signing keys and the ledger are public. Errors are `{ "error": { "code", "message", "field"?, "line"?, "column"? } }`. ' +
			`Counts files are limited to ${MAX_COUNTS_FILE_BYTES} bytes.`
	},
	servers: [{ url: '/' }],
	security: [{ bearerToken: [] }, { sessionCookie: [] }],
	paths: {
		'/api/v1/claims': {
			get: {
				operationId: 'listClaims',
				summary: 'List claims, searched, filtered, sorted and paged',
				parameters: [
					query(
						'q',
						{ type: 'string' },
						'Text found in the title, source description or manuscript reference.'
					),
					query('state', { type: 'string', enum: CLAIM_STATES }, 'Only claims in this state.'),
					query('method', { type: 'string', enum: CLAIM_METHODS }, 'Only claims of this method.'),
					query('sort', { type: 'string', enum: CLAIM_SORTS, default: 'createdAt' }, 'Sort key.'),
					query(
						'order',
						{ type: 'string', enum: ['asc', 'desc'] },
						'Sort order; by default asc for title and state, desc for the other keys (as on the page).'
					),
					query('page', { type: 'integer', minimum: 1, default: 1 }, 'Page number, from 1.'),
					query(
						'pageSize',
						{ type: 'integer', minimum: 1, maximum: 100, default: 20 },
						'Claims per page.'
					)
				],
				responses: {
					'200': reply('One page of claims.', 'ClaimPage'),
					'400': badRequest,
					'401': unauthorised
				}
			},
			post: {
				operationId: 'createClaim',
				summary: 'Create a draft claim',
				requestBody: { required: true, content: body('ClaimInput') },
				responses: {
					'201': reply('The new claim.', 'Claim'),
					'400': badRequest,
					'401': unauthorised,
					'403': failure('The caller belongs to no group.'),
					'404': notFound
				}
			}
		},
		'/api/v1/claims/{id}': {
			get: {
				operationId: 'getClaim',
				summary: 'Read a claim',
				parameters: [idParameter('claim')],
				responses: { '200': reply('The claim.', 'Claim'), '401': unauthorised, '404': notFound }
			},
			put: {
				operationId: 'updateClaim',
				summary: 'Correct every field of a claim before its first check',
				parameters: [idParameter('claim')],
				requestBody: { required: true, content: body('ClaimInput') },
				responses: {
					'200': reply('The corrected claim.', 'Claim'),
					'400': badRequest,
					'401': unauthorised,
					'403': failure('Neither the claim’s author nor a lead of its group.'),
					'404': notFound,
					'409': failure('The claim has been checked and is no longer edited (code conflict).')
				}
			}
		},
		'/api/v1/claims/{id}/datasets': {
			get: {
				operationId: 'listDatasets',
				summary: 'List the claim’s counts files, newest first',
				parameters: [idParameter('claim')],
				responses: {
					'200': {
						description: 'The datasets.',
						content: { 'application/json': { schema: { type: 'array', items: ref('Dataset') } } }
					},
					'401': unauthorised,
					'404': notFound
				}
			},
			post: {
				operationId: 'addDataset',
				summary: 'Upload counts files (CSV, JSON or grids; several at once make one dataset)',
				parameters: [
					idParameter('claim'),
					query('name', { type: 'string' }, 'File name to record for a raw body.'),
					query(
						'basis',
						{ type: 'integer', minimum: 0 },
						'For a raw text/csv body holding one bare d × d grid: its basis (the file is then stored as a counts set).'
					)
				],
				requestBody: {
					required: true,
					content: {
						'multipart/form-data': {
							schema: {
								type: 'object',
								required: ['counts'],
								properties: {
									counts: {
										type: 'string',
										format: 'binary',
										description:
											'A counts file; repeat the part for several files, read together as one dataset (a counts set keeping every file and its SHA-256).'
									},
									basis: {
										type: 'string',
										pattern: '^[0-9]*$',
										description:
											'Optional: one part per counts part, in the same order — the basis of a file holding one bare grid, blank for a file that names its bases. Refused with bad_input, field basis.'
									},
									calibration: {
										type: 'string',
										format: 'binary',
										description:
											'Optional (mub-correlation only): the measured basis vectors, {"dimension": d, "bases": [{"basis": t, "vectors": [[[re, im], …]]}], "tolerance": ε}; refused with bad_input, field calibration.'
									}
								}
							}
						},
						'text/csv': { schema: { type: 'string' } },
						'application/json': {
							schema: {
								type: 'object',
								description: '{"dimension": d, "tables": [{"basis": t, "counts": [[…]]}]}'
							}
						}
					}
				},
				responses: {
					'201': reply('The stored dataset.', 'Dataset'),
					'400': failure(
						'A bad counts file: code bad_counts, with the line at fault (bad_input without a file).'
					),
					'401': unauthorised,
					'403': forbidden,
					'404': notFound,
					'409': failure('The same bytes were uploaded to this claim before (code conflict).'),
					'413': failure(`The file exceeds ${MAX_COUNTS_FILE_BYTES} bytes.`),
					'415': failure('Neither multipart/form-data, text/csv nor application/json.'),
					'429': failure(
						'The caller (or the claim’s group) has as many uploads in progress as allowed (code rate_limited); the message names the limit, Retry-After the seconds to wait.'
					)
				}
			}
		},
		'/api/v1/claims/{id}/datasets/{datasetId}': {
			delete: {
				operationId: 'removeDataset',
				summary: 'Take back an upload that no check has used yet',
				parameters: [idParameter('claim'), { ...idParameter('dataset'), name: 'datasetId' }],
				responses: {
					'204': { description: 'Removed; the removal is in the audit log.' },
					'401': unauthorised,
					'403': forbidden,
					'404': notFound,
					'409': failure('A check has used this dataset, so it stays (code conflict).')
				}
			}
		},
		'/api/v1/claims/{id}/checks': {
			post: {
				operationId: 'startCheck',
				summary: 'Queue a check of the claim on one of its datasets',
				parameters: [idParameter('claim')],
				requestBody: { required: false, content: body('CheckRequest') },
				responses: {
					'202': reply('The queued check; poll its URL (Location header).', 'Check'),
					'400': badRequest,
					'401': unauthorised,
					'403': forbidden,
					'404': notFound,
					'409': failure('The claim has no counts file yet (code conflict).'),
					'429': failure(
						'The caller (or the claim’s group) has as many checks queued or running as allowed (code rate_limited); the message names the limit, Retry-After the seconds to wait.'
					)
				}
			}
		},
		'/api/v1/checks/{id}': {
			get: {
				operationId: 'getCheck',
				summary: 'Read a check: status, progress and, when done, the result',
				parameters: [idParameter('check')],
				responses: { '200': reply('The check.', 'Check'), '401': unauthorised, '404': notFound }
			},
			delete: {
				operationId: 'cancelCheck',
				summary: 'Cancel a queued or running check (whoever may start checks on its claim)',
				parameters: [idParameter('check')],
				responses: {
					'200': reply('The check, now cancelled (cancelledAt, cancelledBy).', 'Check'),
					'401': unauthorised,
					'403': forbidden,
					'404': notFound,
					'409': failure('The check has ended or was cancelled already (code conflict).')
				}
			}
		},
		'/api/v1/tokens': {
			get: {
				operationId: 'listTokens',
				summary: 'List your API tokens, newest first (with a session; tokens do not manage tokens)',
				security: [{ sessionCookie: [] }],
				responses: {
					'200': {
						description: 'Your tokens, revoked and expired ones included.',
						content: { 'application/json': { schema: { type: 'array', items: ref('Token') } } }
					},
					'401': unauthorised,
					'403': forbidden
				}
			},
			post: {
				operationId: 'createToken',
				summary: 'Issue an API token; its secret is in this answer only',
				security: [{ sessionCookie: [] }],
				requestBody: { required: true, content: body('TokenInput') },
				responses: {
					'201': reply('The new token with its secret.', 'CreatedToken'),
					'400': badRequest,
					'401': unauthorised,
					'403': forbidden
				}
			}
		},
		'/api/v1/tokens/{id}': {
			delete: {
				operationId: 'revokeToken',
				summary: 'Revoke one of your tokens',
				security: [{ sessionCookie: [] }],
				parameters: [idParameter('token')],
				responses: {
					'204': { description: 'Revoked (or already revoked).' },
					'401': unauthorised,
					'403': forbidden,
					'404': notFound
				}
			}
		},
		...certificatePaths,
		...citationPaths,
		...planPaths,
		...targetRunPaths,
		'/api/v1/archive': {
			get: {
				operationId: 'groupArchive',
				summary: 'A group’s archive: every claim with its versions, filtered; JSON or CSV',
				parameters: [
					query(
						'group',
						{ type: 'string' },
						'The group’s id (default: the caller’s first group by name).'
					),
					query(
						'q',
						{ type: 'string' },
						'Text found in the title, source description or manuscript reference.'
					),
					query('state', { type: 'string', enum: CLAIM_STATES }, 'Only claims in this state.'),
					query('method', { type: 'string', enum: CLAIM_METHODS }, 'Only claims of this method.'),
					query(
						'dimension',
						{ type: 'integer', minimum: 2 },
						'Only claims of this local dimension.'
					),
					query('from', { type: 'string', format: 'date' }, 'Created on or after this day (UTC).'),
					query('to', { type: 'string', format: 'date' }, 'Created on or before this day (UTC).'),
					query(
						'format',
						{ type: 'string', enum: ['json', 'csv'], default: 'json' },
						'JSON, or CSV with one row per claim version (RFC 4180; text cells starting with = + - @ get a leading apostrophe).'
					),
					query(
						'download',
						{ type: 'string', enum: ['0', '1'] },
						'1 adds a file name (Content-Disposition).'
					)
				],
				responses: {
					'200': {
						description: 'The archive.',
						content: {
							'application/json': { schema: ref('Archive') },
							'text/csv': { schema: { type: 'string' } }
						}
					},
					'400': badRequest,
					'401': unauthorised,
					'403': failure('The caller belongs to no group, so has no archive (code forbidden).'),
					'404': notFound
				}
			}
		},
		'/api/v1/claims/{id}/withdraw': {
			post: {
				operationId: 'withdrawClaim',
				summary: 'Withdraw a claim and its certificates, with a reason recorded on the ledger',
				parameters: [idParameter('claim')],
				requestBody: { required: true, content: body('WithdrawInput') },
				responses: {
					'200': {
						description: 'The claim is withdrawn; the ids of the certificates withdrawn with it.',
						content: body('WithdrawnClaim')
					},
					'400': badRequest,
					'401': unauthorised,
					'403': forbidden,
					'404': notFound,
					'409': failure('The claim is withdrawn already (code conflict).')
				}
			}
		},
		...reviewPaths,
		'/api/v1/openapi.json': {
			get: {
				operationId: 'openApiDocument',
				summary: 'This document',
				security: [],
				responses: {
					'200': {
						description: 'The OpenAPI 3.1 document.',
						content: body('OpenApiDocument')
					}
				}
			}
		}
	},
	components: {
		securitySchemes: {
			bearerToken: {
				type: 'http',
				scheme: 'bearer',
				description: 'An API token (rks_…) from Settings → API tokens.'
			},
			sessionCookie: {
				type: 'apiKey',
				in: 'cookie',
				name: 'rankseal_session',
				description: 'The session cookie of a signed-in browser.'
			}
		},
		schemas: {
			...schemas,
			...certificateSchemas,
			...reviewSchemas,
			...planSchemas,
			...archiveSchemas,
			...requestSchemas
		}
	}
};
