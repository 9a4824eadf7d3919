/** JSON Schemas of certificates, signing keys and the ledger (OpenAPI 3.1 components). */
import { certificateDoiSchema } from './citation-paths';
const text = { type: 'string' };
const hex64 = { type: 'string', pattern: '^[0-9a-f]{64}$' };
const timestamp = { type: 'string', format: 'date-time' };
const nullable = (schema: object) => ({ anyOf: [schema, { type: 'null' }] });
const object = (properties: Record<string, object>, description?: string) => ({
	type: 'object',
	...(description ? { description } : {}),
	required: Object.keys(properties),
	properties
});

export const certificateSchemas = {
	Certificate: object({
		id: text,
		claimId: text,
		checkId: text,
		fingerprint: { ...hex64, description: 'SHA-256 of the canonical manifest.' },
		status: { type: 'string', enum: ['valid', 'superseded', 'withdrawn'] },
		supersedes: nullable(text),
		supersededBy: nullable(text),
		keyId: hex64,
		issuedAt: timestamp,
		certifiedSchmidtNumber: { type: 'integer' },
		verdict: nullable({ type: 'string', enum: ['supported', 'not supported'] }),
		analyses: nullable(
			object(
				{
					total: {
						type: 'integer',
						description: 'Distinct analyses of these counts in the group up to this certificate.'
					},
					declared: {
						type: 'boolean',
						description: "The certified analysis is the claim's declared one."
					},
					exploratory: {
						type: 'boolean',
						description: 'Not the declared analysis alone: stated at the corrected level.'
					},
					nominalConfidence: { type: 'number', description: 'The level the check ran at.' },
					statedConfidence: {
						type: 'number',
						description:
							'The level the certificate states: 1 − (1 − nominal)/total when exploratory.'
					},
					list: { type: 'array', items: { $ref: '#/components/schemas/Analysis' } }
				},
				'Every distinct analysis of the counts up to this certificate (docs/statistics.md §8); null for certificates made before it was recorded.'
			)
		),
		urls: object({
			pdf: text,
			bundle: text,
			verify: { type: 'string', description: 'The public verification page.' }
		}),
		doi: certificateDoiSchema,
		kind: {
			type: 'string',
			enum: ['counts', 'time-ordered-trials'],
			description:
				'counts: i.i.d. counts (bootstrap); time-ordered-trials: a test supermartingale, valid without the i.i.d. assumption (docs/statistics.md).'
		},
		assumption: nullable({
			...text,
			description: 'For time-ordered trials, the assumption the certificate holds under, in words.'
		})
	}),
	Analysis: object({
		method: text,
		bases: { type: 'array', items: { type: 'integer' } },
		fourier: { type: 'string', enum: ['cyclic', 'field'] },
		confidence: { type: 'number' },
		resamples: { type: 'integer' },
		subtractAccidentals: { type: 'boolean' },
		seed: {
			anyOf: [{ type: 'integer' }, { type: 'string', enum: ['derived'] }],
			description: "'derived' (from the counts and the settings) or the seed chosen."
		},
		firstRunAt: timestamp
	}),
	SigningKeys: object({
		keys: {
			type: 'array',
			items: object({
				id: { ...hex64, description: 'SHA-256 of the public key.' },
				algorithm: { type: 'string', enum: ['Ed25519'] },
				publicKey: { ...hex64, description: 'The 32-byte public key as hex.' },
				createdAt: timestamp,
				retiredAt: nullable(timestamp)
			})
		}
	}),
	LedgerCheckpoint: object(
		{
			format: { type: 'string', enum: ['rankseal-checkpoint/1'] },
			entries: { type: 'integer', minimum: 0, description: 'Entries in the ledger.' },
			head: { ...hex64, description: 'Hash of the newest entry (64 zeros when empty).' },
			at: timestamp,
			keyId: { ...hex64, description: 'The signing key (SHA-256 of its public key).' },
			signature: {
				type: 'string',
				pattern: '^[0-9a-f]{128}$',
				description: 'Ed25519 over the RFC 8785 JSON of the other five fields.'
			}
		},
		'The ledger signed as it stands; `ledger:verify --checkpoint FILE` later shows whether the ledger still extends it.'
	),
	LedgerPage: object({
		items: {
			type: 'array',
			items: object({
				seq: { type: 'integer' },
				event: {
					type: 'string',
					enum: ['issue', 'supersede', 'withdraw', 'key'],
					description:
						'`key`: a new signing key, introduced by an entry signed with the key before it.'
				},
				certificateId: nullable(text),
				at: timestamp,
				prevHash: hex64,
				hash: hex64,
				keyId: hex64,
				signature: text,
				payload: {
					type: 'string',
					description:
						'The canonical JSON that was hashed and signed, except for the fields named in redacted.'
				},
				redacted: {
					type: 'array',
					items: { type: 'string' },
					description:
						'Payload fields shown otherwise than signed: an old entry names its withdrawer or issuer by role (details.byRole, details.issuerRole) in place of an account id (details.by, details.issuedBy). Newer issue entries bind the issuer by details.issuerDigest, SHA-256 of "rankseal-issuer:<issuerSalt>:<account id>". Usually empty.'
				}
			})
		},
		total: { type: 'integer' },
		page: { type: 'integer' },
		pageSize: { type: 'integer' }
	})
};

// Sign in with ORCID: GET /certificates/{id} also names the authors with their ORCID iDs
// (optional, so the lists and the issue answer, which leave it out, still match).
Object.assign(certificateSchemas.Certificate.properties, {
	authors: {
		type: 'array',
		description:
			"The claim's authors as the PDF names them (its creator first), each with the ORCID iD linked to their account now.",
		items: object({
			name: text,
			orcid: nullable({ ...text, pattern: '^\\d{4}-\\d{4}-\\d{4}-\\d{3}[\\dX]$' })
		})
	}
});
