/** The DOI and citation parts of the OpenAPI document (issue 21): a block of its own. */
import { CITATION_FORMATS, CITATION_TYPES } from '$lib/server/certificates/citation';

const error = (description: string) => ({
	description,
	content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } }
});
const media = (type: string) => type.split(';')[0];

export const citationPaths = {
	'/api/v1/certificates/{id}/citation': {
		get: {
			operationId: 'getCertificateCitation',
			summary: 'The certificate’s citation as BibTeX, RIS or plain text',
			description: 'Who may read the certificate’s JSON may read its citation.',
			parameters: [
				{
					name: 'id',
					in: 'path',
					required: true,
					description: 'The certificate’s id.',
					schema: { type: 'string' }
				},
				{
					name: 'format',
					in: 'query',
					required: false,
					description: 'BibTeX, RIS or plain text; any other answers 400 naming `format`.',
					schema: { type: 'string', enum: CITATION_FORMATS, default: 'text' }
				}
			],
			responses: {
				'200': {
					description: 'The citation, with its format’s media type.',
					content: Object.fromEntries(
						Object.values(CITATION_TYPES).map((t) => [media(t), { schema: { type: 'string' } }])
					)
				},
				'400': error('A format not offered (code bad_input, field format).'),
				'401': error('Neither a session cookie nor a valid bearer token.'),
				'404': error('No such certificate in the caller’s groups (code not_found).'),
				'409': error('A certificate from before DOIs, not yet given one (at the next start).')
			}
		}
	}
};

const nullable = (schema: object) => ({ anyOf: [schema, { type: 'null' }] });

/** The `doi` of a certificate (JSON and public record). */
export const certificateDoiSchema = nullable({
	type: 'object',
	description:
		'The certificate’s DOI, fixed at issue; null for one from before DOIs until the next start.',
	required: ['doi', 'url', 'registration'],
	properties: {
		doi: { type: 'string', description: 'The DOI name (prefix/suffix).' },
		url: { type: 'string', description: 'Where it resolves (https://doi.org/… with DataCite).' },
		registration: {
			type: 'string',
			enum: ['pending', 'registered', 'updating', 'failed'],
			description:
				'pending: not yet accepted by the registry; updating: registered, a change on its way.'
		}
	}
});
