/**
 * Holds real answers of the API against its OpenAPI 3.1 document: the status must be documented
 * for the operation, the content type one it lists, and a JSON body valid against the schema it
 * gives (JSON Schema 2020-12, the dialect of OpenAPI 3.1, checked with Ajv).
 */
import { Ajv2020, type ValidateFunction } from 'ajv/dist/2020.js';
import addFormats from 'ajv-formats';

type Media = Record<string, { schema?: object }>;
type Operation = { operationId: string; responses: Record<string, { content?: Media }> };
export type ApiDocument = {
	paths: Record<string, Record<string, Operation>>;
	components: { schemas: Record<string, object> };
};

export interface Answer {
	method: string;
	/** The route as the source tree names it: /api/v1/claims/[id]. */
	route: string;
	status: number;
	contentType: string;
	body: Buffer;
}

export class DocumentChecker {
	private readonly ajv: Ajv2020;
	private readonly compiled = new Map<string, ValidateFunction>();
	/** operationId → the statuses answered and held against the document. */
	readonly answered = new Map<string, Set<number>>();
	readonly problems: string[] = [];

	constructor(private readonly document: ApiDocument) {
		this.ajv = new Ajv2020({ strict: false, allErrors: true });
		addFormats.default(this.ajv);
		this.ajv.addSchema({ $id: 'rankseal-api', components: document.components });
	}

	/** Every operation the document describes, by operationId. */
	operations(): string[] {
		return Object.values(this.document.paths).flatMap((methods) =>
			Object.values(methods).map((operation) => operation.operationId)
		);
	}

	/** Holds one answer against the document; a mismatch is kept in `problems`. */
	check(answer: Answer): void {
		const where = `${answer.method} ${answer.route} → ${answer.status}`;
		const path = answer.route.replace(/\[(\w+)\]/g, '{$1}');
		const operation = this.document.paths[path]?.[answer.method.toLowerCase()];
		if (!operation) return void this.problems.push(`${where}: no such operation in the document`);
		const seen = this.answered.get(operation.operationId) ?? new Set<number>();
		this.answered.set(operation.operationId, seen.add(answer.status));
		const response = operation.responses[String(answer.status)];
		if (!response) return void this.problems.push(`${where}: status not documented`);
		const type = answer.contentType.split(';')[0].trim();
		if (answer.status === 204 || !response.content) {
			if (answer.body.length > 0) this.problems.push(`${where}: a body the document does not give`);
			return;
		}
		const media = response.content[type];
		if (!media) return void this.problems.push(`${where}: content type ${type} not documented`);
		if (type !== 'application/json' || !media.schema) return;
		const validate = this.validator(path, answer.method, answer.status, media.schema);
		if (!validate(JSON.parse(answer.body.toString('utf8'))))
			this.problems.push(`${where}: ${this.ajv.errorsText(validate.errors)}`);
	}

	private validator(path: string, method: string, status: number, schema: object) {
		const key = `${method} ${path} ${status}`;
		let validate = this.compiled.get(key);
		if (!validate) {
			// References point into the document's components, registered under its own $id.
			const text = JSON.stringify(schema).replaceAll(
				'"#/components/',
				'"rankseal-api#/components/'
			);
			validate = this.ajv.compile(JSON.parse(text));
			this.compiled.set(key, validate);
		}
		return validate;
	}
}
