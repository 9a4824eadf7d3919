/** JSON Schemas (OpenAPI 3.1 components) of the API's bodies, kept beside the document. */
import { FOURIER_CONVENTIONS, METHOD_IDS } from '$lib/certify';
import { CLAIM_METHODS, CLAIM_STATES } from '$lib/claims/schema';
import { CHECK_STATUSES } from '$lib/server/db/models/Check';
import { PROBLEM_CODES } from '$lib/server/http/problems';

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const text = { type: 'string' };
const whole = { type: 'integer' };
const number = { type: 'number' };
const timestamp = { type: 'string', format: 'date-time' };
const nullable = (schema: object) => ({ anyOf: [schema, { type: 'null' }] });
const method = { type: 'string', enum: METHOD_IDS };
/** A claim's method: the witness families and fidelity-target (witnesses.md §4.3′). */
const claimMethod = { type: 'string', enum: CLAIM_METHODS };
const fourier = {
	type: 'string',
	enum: FOURIER_CONVENTIONS,
	description:
		'Which Fourier basis basis 1 is: cyclic (the Z_d transform, every d) or field (the GF(p^s) basis and its d + 1 MUBs, prime powers only). For prime d they are the same bases.'
};

export const schemas = {
	Error: {
		type: 'object',
		required: ['error'],
		properties: {
			error: {
				type: 'object',
				required: ['code', 'message'],
				properties: {
					code: {
						type: 'string',
						enum: PROBLEM_CODES,
						description:
							'bad_input 400 (a field of the body or query), bad_counts 400 (the counts file), ' +
							'unauthorised 401, forbidden 403 (visible but not yours to do), not_found 404, ' +
							'conflict 409 (not in a state that allows it, e.g. no counts file yet), too_large 413, ' +
							'unsupported_media_type 415, rate_limited 429 (see Retry-After), ' +
							'unavailable 503 (the service is stopping; see Retry-After).'
					},
					message: {
						type: 'string',
						description: 'Plain words; for bad input it names the fields or the line.'
					},
					field: { ...text, description: 'bad_input only: the field at fault, when one is.' },
					line: {
						...whole,
						description: 'bad_counts only: the line of the counts file at fault, when known.'
					},
					column: { ...whole, description: 'bad_counts only: the column, when known.' }
				}
			}
		}
	},
	Token: {
		type: 'object',
		required: ['id', 'name', 'prefix', 'createdAt', 'lastUsedAt', 'revokedAt', 'expiresAt'],
		properties: {
			id: text,
			name: text,
			prefix: { ...text, description: 'The first characters, to tell tokens apart.' },
			createdAt: timestamp,
			lastUsedAt: nullable(timestamp),
			revokedAt: nullable(timestamp),
			expiresAt: { ...nullable(timestamp), description: 'null: it never expires.' }
		}
	},
	CreatedToken: {
		allOf: [
			ref('Token'),
			{
				type: 'object',
				required: ['token'],
				properties: { token: { ...text, description: 'rks_…, shown this once.' } }
			}
		]
	},
	Claim: {
		type: 'object',
		required: [
			'id',
			'groupId',
			'groupName',
			'title',
			'dimension',
			'method',
			'bases',
			'fourier',
			'claimedSchmidtNumber',
			'state',
			'createdAt',
			'updatedAt',
			'latestCheck'
		],
		properties: {
			id: text,
			groupId: text,
			groupName: text,
			title: text,
			sourceDescription: text,
			dimension: whole,
			method: claimMethod,
			bases: { type: 'array', items: whole },
			fourier,
			claimedSchmidtNumber: whole,
			manuscriptReference: nullable(text),
			state: { type: 'string', enum: CLAIM_STATES },
			trials: nullable({
				type: 'object',
				description: 'A claim on time-ordered trials: its mode and probabilities (null: uniform).',
				properties: {
					mode: { type: 'string', enum: ['trials', 'blocks'] },
					probabilities: nullable({ type: 'array', items: { type: 'number' } })
				}
			}),
			target: nullable({
				type: 'object',
				description:
					'fidelity-target: the declared λ (Σλ² = 1) and, when Rankseal scaled it, λ as declared (else null).',
				properties: {
					coefficients: { type: 'array', items: { type: 'number' } },
					declared: nullable({ type: 'array', items: { type: 'number' } })
				}
			}),
			targetFrom: nullable({
				type: 'string',
				enum: ['declared', 'calibration-run'],
				description: 'fidelity-target: where λ comes from (null for other methods).'
			}),
			targetRun: nullable({
				type: 'object',
				description:
					'The calibration run λ was fitted on and frozen by: its SHA-256, file name and matching counts N_mm (null until uploaded).',
				properties: {
					sha256: { type: 'string' },
					name: { type: 'string' },
					diagonal: { type: 'array', items: { type: 'number' } }
				}
			}),
			withdrawal: nullable({
				type: 'object',
				description:
					'Why and when the claim was withdrawn; it then takes no new counts, checks or certificates (409).',
				properties: { reason: text, at: timestamp }
			}),
			createdBy: {
				type: 'object',
				properties: { id: text, name: text, orcid: { anyOf: [text, { type: 'null' }] } }
			},
			createdAt: timestamp,
			updatedAt: timestamp,
			latestCheck: nullable({
				type: 'object',
				properties: {
					id: text,
					status: ref('CheckStatus'),
					certifiedSchmidtNumber: nullable(whole),
					verdict: nullable({ type: 'string', enum: ['supported', 'not supported'] })
				}
			})
		}
	},
	ClaimPage: {
		type: 'object',
		required: ['items', 'total', 'page', 'pageSize'],
		properties: {
			items: { type: 'array', items: ref('Claim') },
			total: whole,
			page: whole,
			pageSize: whole
		}
	},
	Dataset: {
		type: 'object',
		required: [
			'id',
			'claimId',
			'sha256',
			'byteSize',
			'format',
			'originalName',
			'createdAt',
			'summary'
		],
		properties: {
			id: text,
			claimId: text,
			sha256: {
				type: 'string',
				pattern: '^[0-9a-f]{64}$',
				description: 'SHA-256 of the stored bytes.'
			},
			byteSize: whole,
			format: { type: 'string', enum: ['csv', 'json'] },
			originalName: text,
			createdAt: timestamp,
			calibrationSha256: {
				anyOf: [{ type: 'string', pattern: '^[0-9a-f]{64}$' }, { type: 'null' }],
				description: 'SHA-256 of the calibration file uploaded beside the counts, or null.'
			},
			summary: {
				type: 'object',
				properties: {
					dimension: whole,
					bases: { type: 'array', items: whole },
					totals: {
						type: 'object',
						additionalProperties: number,
						description: 'Total counts per basis.'
					},
					hasAccidentals: { type: 'boolean' },
					hasDurations: { type: 'boolean' },
					allows: {
						type: 'array',
						items: method,
						description: 'Methods whose tables the file completes.'
					},
					readAs: {
						...text,
						description:
							'How a grid file was read, e.g. "read as 3 grids of 5 × 5, tab-separated"; absent for long-form CSV and JSON.'
					}
				}
			}
		}
	},
	CheckStatus: { type: 'string', enum: [...CHECK_STATUSES] },
	Check: {
		type: 'object',
		required: [
			'id',
			'claimId',
			'datasetId',
			'status',
			'progress',
			'resamples',
			'confidence',
			'seed',
			'createdAt',
			'result'
		],
		properties: {
			id: text,
			claimId: text,
			datasetId: text,
			status: ref('CheckStatus'),
			progress: { ...number, minimum: 0, maximum: 1 },
			resamples: whole,
			confidence: number,
			seed: whole,
			subtractAccidentals: { type: 'boolean' },
			createdAt: timestamp,
			startedAt: nullable(timestamp),
			finishedAt: nullable(timestamp),
			error: nullable(text),
			result: nullable(ref('CertificationResult')),
			countsAdvice: nullable({
				type: 'object',
				description:
					'For an unsupported claim that more counts would certify: the total counts, in the data’s proportions, for a 90 % chance, simulated once after the check (not part of the signed result).',
				properties: {
					schmidtNumber: whole,
					totalCounts: nullable(whole),
					factor: nullable(number),
					power: nullable(number),
					experiments: whole,
					resamples: whole,
					reason: nullable(text)
				}
			}),
			cancelledAt: nullable(timestamp),
			cancelledBy: {
				...nullable(text),
				description: 'Who cancelled it: the account’s name, or "the referee" for a review link.'
			},
			byReferee: {
				type: 'boolean',
				description:
					"A referee's re-run from a review link: never listed among the authors' checks, never certified."
			}
		}
	},
	CertificationResult: {
		type: 'object',
		description: 'The fields of the command line’s --json output.',
		required: [
			'method',
			'dimension',
			'bases',
			'statistic',
			'bounds',
			'certifiedSchmidtNumber',
			'confidence',
			'resamples',
			'seed',
			'inputSha256'
		],
		properties: {
			method,
			dimension: whole,
			bases: { type: 'array', items: whole },
			fourier,
			statistic: {
				type: 'object',
				properties: {
					value: number,
					standardError: number,
					lower: { ...number, description: 'One-sided lower confidence bound.' },
					interval95: { type: 'array', items: number, minItems: 2, maxItems: 2 },
					deltaMethodStandardError: number
				}
			},
			bounds: {
				type: 'array',
				items: {
					type: 'object',
					properties: {
						upToSchmidtNumber: whole,
						bound: number,
						marginInStandardErrors: nullable(number),
						criticalVisibility: number
					}
				}
			},
			pointSchmidtNumber: whole,
			certifiedSchmidtNumber: whole,
			confidence: number,
			resamples: whole,
			seed: whole,
			inputSha256: nullable(text),
			claim: nullable({
				type: 'object',
				properties: {
					schmidtNumber: whole,
					verdict: { type: 'string', enum: ['supported', 'not supported'] },
					boundToBeat: number,
					visibilityNeeded: number,
					moreCountsHelp: {
						type: 'boolean',
						description:
							'Unsupported, but the point value clears the rung: more counts would certify it (the check’s countsAdvice says how many).'
					},
					shortfall: text
				}
			}),
			effectiveVisibility: number,
			steeringRobustness: nullable({
				type: 'object',
				properties: { value: number, lower: number }
			}),
			trust: { type: 'string', enum: ['device-dependent', 'one-sided device-independent'] },
			reference: text,
			normalisation: { type: 'string', enum: ['counts', 'rates'] },
			backgroundSubtracted: { type: 'boolean' },
			resampling: { type: 'string', enum: ['sufficient-totals', 'per-cell'] },
			totalCounts: number,
			calibration: nullable({
				type: 'object',
				description: 'The measured bases the ladder used (witnesses.md §4.4).',
				properties: {
					sha256: nullable(text),
					tolerance: number,
					bases: { type: 'array', items: whole },
					mu: number,
					muUpper: number,
					muPlus: number,
					largestBias: number,
					eigenvalueMethod: { type: 'string', enum: ['cholesky-certified', 'gershgorin'] }
				}
			}),
			calibrationTolerance: nullable({
				type: 'object',
				description:
					'Correlation sums: the largest δ such that the certificate holds for any bases with every d·|⟨a_t|b_s⟩|² within 1 ± δ (null value: not computed, with the reason).',
				properties: { value: nullable(number), note: text }
			}),
			warnings: { type: 'array', items: text },
			engine: { type: 'object', properties: { version: text, generator: text, poisson: text } }
		}
	}
};
