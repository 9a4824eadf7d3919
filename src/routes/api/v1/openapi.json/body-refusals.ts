/**
 * The refusals every JSON body can meet, added to each operation that takes one, so that the
 * document says them once: 413 over the size limit (chunked too), 415 for another content type.
 */
import { JSON_BODY_LIMIT } from '$lib/server/http/json-body';

const error = (description: string) => ({
	description,
	content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } }
});

const REFUSALS = {
	'413': error(`The body is larger than ${JSON_BODY_LIMIT} bytes (code too_large).`),
	'415': error(
		'The body is not sent as Content-Type: application/json (code unsupported_media_type).'
	)
};

type Operation = { requestBody?: { content?: object }; responses?: Record<string, unknown> };

/** The document with 413 and 415 on every operation whose body is JSON only. */
export function withBodyRefusals<T extends { paths: object }>(document: T): T {
	for (const operations of Object.values(document.paths) as Record<string, Operation>[])
		for (const operation of Object.values(operations)) {
			const types = Object.keys(operation.requestBody?.content ?? {});
			if (types.length !== 1 || types[0] !== 'application/json') continue;
			operation.responses = { ...operation.responses, ...REFUSALS };
		}
	return document;
}
