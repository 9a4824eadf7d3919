/**
 * A client for a DataCite-compatible REST API (the real one or the local fake): JSON:API bodies
 * `{ data: { type: 'dois', attributes } }`, HTTP Basic auth with the repository id and password.
 */
import type { DataciteAttributes } from './datacite-metadata';

export interface RegistryAccount {
	/** Base URL, e.g. https://api.test.datacite.org */
	url: string;
	user: string;
	password: string;
}

/** A refusal or failure of the registry; `permanent` when sending again cannot help (bad metadata). */
export class RegistryError extends Error {
	constructor(
		message: string,
		readonly status: number | null,
		readonly permanent: boolean
	) {
		super(message);
		this.name = 'RegistryError';
	}
}

const JSON_API = 'application/vnd.api+json';
/** A stalled registry must not hold the sender: one request gets this long. */
const REQUEST_TIMEOUT_MS = 20_000;

interface JsonApiError {
	source?: string | { pointer?: string };
	title?: string;
	detail?: string;
}

function errorText(status: number, body: unknown): string {
	const errors = (body as { errors?: JsonApiError[] } | null)?.errors ?? [];
	const said = errors.map((e) => {
		const where = typeof e.source === 'string' ? e.source : e.source?.pointer;
		return `${where ? `${where}: ` : ''}${e.title ?? e.detail ?? 'error'}`;
	});
	return `registry answered ${status}${said.length ? `: ${said.join('; ')}` : ''}`;
}

/** 408 and 429 are worth another try later; other 4xx mean this request will never pass. */
const permanentStatus = (status: number) =>
	status >= 400 && status < 500 && ![408, 429].includes(status);

export function dataciteClient(account: RegistryAccount) {
	const base = account.url.replace(/\/+$/, '');
	const authorization = `Basic ${Buffer.from(`${account.user}:${account.password}`).toString('base64')}`;

	async function send(method: string, path: string, attributes?: DataciteAttributes) {
		let response: Response;
		try {
			response = await fetch(`${base}${path}`, {
				method,
				headers: { authorization, accept: JSON_API, 'content-type': JSON_API },
				body: attributes ? JSON.stringify({ data: { type: 'dois', attributes } }) : undefined,
				signal: AbortSignal.timeout(REQUEST_TIMEOUT_MS)
			});
		} catch (error) {
			const cause = (error as { cause?: { code?: string } }).cause?.code;
			throw new RegistryError(
				`registry unreachable: ${cause ?? (error as Error).message}`,
				null,
				false
			);
		}
		const body = await response.json().catch(() => null);
		if (!response.ok)
			throw new RegistryError(
				errorText(response.status, body),
				response.status,
				permanentStatus(response.status)
			);
		return body as { data: { id: string; attributes: Record<string, unknown> } };
	}

	const path = (doi: string) => `/dois/${doi.split('/').map(encodeURIComponent).join('/')}`;
	return {
		create: (attributes: DataciteAttributes) => send('POST', '/dois', attributes),
		update: (doi: string, attributes: DataciteAttributes) => send('PUT', path(doi), attributes),
		get: (doi: string) => send('GET', path(doi))
	};
}

export type DataciteClient = ReturnType<typeof dataciteClient>;
