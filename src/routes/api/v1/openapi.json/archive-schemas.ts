/** JSON Schemas of the group archive and the withdrawal answer (OpenAPI 3.1 components). */
import { CLAIM_METHODS, CLAIM_STATES } from '$lib/claims/schema';

const text = { type: 'string' };
const whole = { type: 'integer' };
const timestamp = { type: 'string', format: 'date-time' };
const nullable = (schema: object) => ({ anyOf: [schema, { type: 'null' }] });
const object = (properties: Record<string, object>) => ({
	type: 'object',
	required: Object.keys(properties),
	properties
});

const archiveVersion = object({
	version: whole,
	certificateId: nullable(text),
	fingerprint: nullable(text),
	status: { type: 'string', enum: ['valid', 'superseded', 'withdrawn', 'uncertified'] },
	at: timestamp,
	checkId: nullable(text),
	certifiedSchmidtNumber: nullable(whole)
});

export const archiveSchemas = {
	Archive: object({
		format: { type: 'string', const: 'rankseal-archive/1' },
		exportedAt: timestamp,
		group: object({ id: text, name: text }),
		filter: { type: 'object', description: 'The filter the archive was made with.' },
		claims: {
			type: 'array',
			items: object({
				id: text,
				title: text,
				state: { type: 'string', enum: CLAIM_STATES },
				method: { type: 'string', enum: CLAIM_METHODS },
				dimension: whole,
				fourier: text,
				claimedSchmidtNumber: whole,
				sourceDescription: text,
				manuscriptReference: nullable(text),
				createdAt: timestamp,
				withdrawnAt: nullable(timestamp),
				withdrawnReason: nullable(text),
				versions: { type: 'array', items: archiveVersion }
			})
		}
	}),
	WithdrawnClaim: object({
		id: text,
		state: { type: 'string', const: 'withdrawn' },
		reason: text,
		withdrawnCertificates: { type: 'array', items: text }
	}),
	OwnReport: object({ report: nullable({ $ref: '#/components/schemas/Report' }) }),
	OpenApiDocument: {
		type: 'object',
		required: ['openapi', 'info', 'paths', 'components'],
		properties: { openapi: { type: 'string', pattern: '^3\\.1\\.' } }
	}
};
