/** A fidelity-target claim's calibration run (witnesses.md §4.3′, §9) in the OpenAPI document. */
import { MAX_COUNTS_FILE_BYTES } from '$lib/certify';

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const failure = (description: string) => ({
	description,
	content: { 'application/json': { schema: ref('Error') } }
});

export const targetRunPaths = {
	'/api/v1/claims/{id}/target-run': {
		post: {
			operationId: 'addTargetRun',
			summary:
				'Upload the calibration run of a fidelity-target claim made with targetFrom calibration-run: λ is fitted on it (λ_m² the share of matching pairs in basis 0) and frozen',
			parameters: [
				{ name: 'id', in: 'path', required: true, schema: { type: 'string' } },
				{
					name: 'name',
					in: 'query',
					required: false,
					schema: { type: 'string' },
					description: 'File name to record for a raw body.'
				}
			],
			requestBody: {
				required: true,
				content: {
					'multipart/form-data': {
						schema: {
							type: 'object',
							required: ['targetRun'],
							properties: { targetRun: { type: 'string', format: 'binary' } }
						}
					},
					'text/csv': { schema: { type: 'string' } },
					'application/json': { schema: { type: 'object' } }
				}
			},
			responses: {
				'201': {
					description: 'The claim, λ frozen (targetRun names the run).',
					content: { 'application/json': { schema: ref('Claim') } }
				},
				'400': failure(
					'A run that cannot be read or fitted, that equals one of the claim’s counts files, or a claim that declares λ (code bad_input, field targetRun).'
				),
				'401': failure('Not signed in.'),
				'403': failure('Not a member of the claim’s group.'),
				'404': failure('No such claim in sight.'),
				'409': failure('λ is frozen already: a claim takes one run (code conflict).'),
				'413': failure(`The run exceeds ${MAX_COUNTS_FILE_BYTES} bytes.`),
				'415': failure('Neither multipart/form-data, text/csv nor application/json.'),
				'429': failure('Too many uploads in progress (code rate_limited); Retry-After says when.')
			}
		}
	}
};
