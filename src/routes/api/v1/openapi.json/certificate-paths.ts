/** The certificate, signing-key and ledger endpoints of the OpenAPI document, with their schemas. */
import { LEDGER_PAGE_SIZE } from '$lib/server/ledger/ledger';

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const reply = (description: string, name: string) => ({
	description,
	content: { 'application/json': { schema: ref(name) } }
});
const failure = (description: string) => reply(description, 'Error');
const idParameter = (what: string) => ({
	name: 'id',
	in: 'path',
	required: true,
	description: `The ${what}’s id.`,
	schema: { type: 'string' }
});
const pageParameter = (name: string, schema: object, description: string) => ({
	name,
	in: 'query',
	required: false,
	description,
	schema
});
const file = (type: string, description: string) => ({
	description,
	content: { [type]: { schema: { type: 'string', format: 'binary' } } }
});

const unauthorised = failure('Neither a session cookie nor a valid bearer token.');
const notFound = failure('No such certificate or claim in the caller’s groups (code not_found).');
const forbidden = failure('Visible to the caller, but not theirs to do (code forbidden).');
const getOne = (operationId: string, summary: string, ok: object, readsCounts = false) => ({
	get: {
		operationId,
		summary,
		parameters: [idParameter('certificate')],
		responses: {
			'200': ok,
			'401': unauthorised,
			...(readsCounts ? { '403': failure('A review link does not give the counts file.') } : {}),
			'404': notFound
		}
	}
});

export const certificatePaths = {
	'/api/v1/claims/{id}/certificates': {
		get: {
			operationId: 'listCertificates',
			summary: 'The claim’s certificates, newest first',
			parameters: [idParameter('claim')],
			responses: {
				'200': {
					description: 'The certificates, superseded and withdrawn ones included.',
					content: {
						'application/json': { schema: { type: 'array', items: ref('Certificate') } }
					}
				},
				'401': unauthorised,
				'404': notFound
			}
		},
		post: {
			operationId: 'issueCertificate',
			summary: 'Issue a signed certificate for a finished check; the current one is superseded',
			parameters: [idParameter('claim')],
			requestBody: {
				required: true,
				content: { 'application/json': { schema: ref('CertificateRequest') } }
			},
			responses: {
				'201': reply('The new certificate (Location: its address).', 'Certificate'),
				'400': failure('The body fails validation (code bad_input).'),
				'401': unauthorised,
				'403': forbidden,
				'404': notFound,
				'409': failure(
					"The check is not finished or no longer re-runs, is a referee's re-run from a review link, or another certificate was issued meanwhile (code conflict)."
				)
			}
		}
	},
	'/api/v1/certificates/{id}': getOne(
		'getCertificate',
		'Read a certificate',
		reply('The certificate.', 'Certificate')
	),
	'/api/v1/certificates/{id}/pdf': getOne(
		'getCertificatePdf',
		'The certificate as PDF',
		file('application/pdf', 'The PDF, as issued.')
	),
	'/api/v1/certificates/{id}/bundle': getOne(
		'getCertificateBundle',
		'The evidence bundle (zip) with its offline verifier, verify.mjs',
		file('application/zip', 'The bundle, as issued.'),
		true
	),
	'/api/v1/certificates/{id}/withdraw': {
		post: {
			operationId: 'withdrawCertificate',
			summary: 'Withdraw one certificate, with a reason recorded on the ledger; the claim stays',
			parameters: [idParameter('certificate')],
			requestBody: {
				required: true,
				content: { 'application/json': { schema: ref('WithdrawInput') } }
			},

			responses: {
				'200': reply('The certificate, now withdrawn.', 'Certificate'),
				'400': failure('The reason is missing, too short or too long (code bad_input).'),
				'401': unauthorised,
				'403': failure(
					'Only the group’s lead or the certificate’s issuer, signed in (code forbidden).'
				),
				'404': notFound,
				'409': failure('The certificate is withdrawn already (code conflict).')
			}
		}
	},
	'/api/v1/signing-keys': {
		get: {
			operationId: 'listSigningKeys',
			summary: 'Every Ed25519 key the service has signed with (public, no sign-in)',
			security: [],
			responses: { '200': reply('The keys, oldest first.', 'SigningKeys') }
		}
	},
	'/api/v1/ledger': {
		get: {
			operationId: 'listLedger',
			summary: 'The certificate ledger, oldest entry first, paged (public, no sign-in)',
			security: [],
			parameters: [
				pageParameter('page', { type: 'integer', minimum: 1, default: 1 }, 'Page number, from 1.'),
				pageParameter(
					'pageSize',
					{ type: 'integer', minimum: 1, maximum: 200, default: LEDGER_PAGE_SIZE },
					'Entries per page.'
				)
			],
			responses: {
				'200': reply('One page of the ledger.', 'LedgerPage'),
				'400': failure('A bad page or pageSize (code bad_input).')
			}
		}
	},
	'/api/v1/ledger/checkpoint': {
		get: {
			operationId: 'getLedgerCheckpoint',
			summary: 'The ledger’s signed checkpoint now: entry count, head hash, time (public)',
			security: [],
			responses: {
				'200': reply('The checkpoint; keep it to check the ledger later.', 'LedgerCheckpoint')
			}
		}
	}
};
