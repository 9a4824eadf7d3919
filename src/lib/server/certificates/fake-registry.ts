/**
 * The local fake DOI registry: a real HTTP server on 127.0.0.1 answering the part of DataCite's
 * REST API Rankseal uses (POST /dois, PUT and GET /dois/{doi}, Basic auth, 4xx with JSON:API
 * errors) and a resolver (GET /{doi} redirects to the registered URL), for development, the demo
 * and the tests. Records persist in a JSON file when one is given.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { recordErrors } from './fake-registry-rules';

export interface FakeRegistryOptions {
	prefix: string;
	user: string;
	password: string;
	/** Port to listen on (0: any free port). */
	port: number;
	/** Where records are kept between starts; none: in memory. */
	file?: string;
}

export interface FakeRegistry {
	url: string;
	port: number;
	close(): Promise<void>;
}

type State = 'draft' | 'registered' | 'findable';
interface DoiRecord {
	state: State;
	attributes: Record<string, unknown>;
	created: string;
	updated: string;
}

const MAX_BODY = 1024 * 1024;
const JSON_API = 'application/vnd.api+json';
type Reply = { status: number; body?: unknown; location?: string };
const problem = (status: number, source: string | null, title: string): Reply => ({
	status,
	body: { errors: [{ status: String(status), ...(source ? { source } : {}), title }] }
});

function load(file?: string): Map<string, DoiRecord> {
	if (!file) return new Map();
	try {
		return new Map(Object.entries(JSON.parse(readFileSync(file, 'utf8'))));
	} catch {
		return new Map();
	}
}

async function bodyOf(request: IncomingMessage): Promise<unknown> {
	const chunks: Buffer[] = [];
	let size = 0;
	for await (const chunk of request) {
		size += (chunk as Buffer).length;
		if (size > MAX_BODY) throw problem(413, null, 'The body is too large.');
		chunks.push(chunk as Buffer);
	}
	try {
		return JSON.parse(Buffer.concat(chunks).toString('utf8'));
	} catch {
		throw problem(400, null, 'The body is not JSON.');
	}
}

export function fakeRegistryHandler(options: FakeRegistryOptions) {
	const records = load(options.file);
	const save = () =>
		options.file && writeFileSync(options.file, JSON.stringify(Object.fromEntries(records)));
	const expected = `Basic ${Buffer.from(`${options.user}:${options.password}`).toString('base64')}`;
	const view = (doi: string, r: DoiRecord) => ({
		data: {
			id: doi,
			type: 'dois',
			attributes: { ...r.attributes, doi, state: r.state, created: r.created, updated: r.updated }
		}
	});

	/** Merges the attributes into the record (new or old), checking them if it is to be Findable. */
	function write(
		doi: string,
		old: DoiRecord | undefined,
		attributes: Record<string, unknown>
	): Reply {
		const { event, ...rest } = attributes;
		const merged = { ...(old?.attributes ?? {}), ...rest, doi };
		const state: State =
			event === 'publish' ? 'findable' : event === 'hide' ? 'registered' : (old?.state ?? 'draft');
		if (old?.state === 'findable' && state === 'draft')
			return problem(422, 'event', 'A Findable DOI cannot become a draft.');
		const errors = state === 'draft' ? [] : recordErrors(merged);
		if (errors.length)
			return { status: 422, body: { errors: errors.map((e) => ({ status: '422', ...e })) } };
		const now = new Date().toISOString();
		records.set(doi, { state, attributes: merged, created: old?.created ?? now, updated: now });
		save();
		return { status: old ? 200 : 201, body: view(doi, records.get(doi)!) };
	}

	async function writeRequest(request: IncomingMessage, doiInPath: string | null): Promise<Reply> {
		if (request.headers.authorization !== expected) return problem(401, null, 'Bad credentials.');
		if (!(request.headers['content-type'] ?? '').startsWith(JSON_API))
			return problem(415, null, `Send ${JSON_API}.`);
		const body = (await bodyOf(request)) as {
			data?: { type?: string; attributes?: Record<string, unknown> };
		};
		if (
			body?.data?.type !== 'dois' ||
			typeof body.data.attributes !== 'object' ||
			!body.data.attributes
		)
			return problem(400, 'data', 'Expected { data: { type: "dois", attributes } }.');
		const doi = String(doiInPath ?? body.data.attributes.doi ?? '').toLowerCase();
		if (!doi.startsWith(`${options.prefix.toLowerCase()}/`))
			return problem(403, 'doi', `This repository may only use the prefix ${options.prefix}.`);
		const old = records.get(doi);
		if (doiInPath === null && old) return problem(422, 'doi', 'This DOI has already been taken.');
		if (doiInPath !== null && !old)
			return problem(404, null, 'The resource you are looking for does not exist.');
		return write(doi, old, body.data.attributes);
	}

	function resolve(doi: string): Reply {
		const r = records.get(doi);
		if (!r || r.state === 'draft') return problem(404, null, 'DOI not found.');
		return { status: 302, location: String(r.attributes.url) };
	}

	return async (request: IncomingMessage): Promise<Reply> => {
		const path = decodeURIComponent(new URL(request.url ?? '/', 'http://fake').pathname);
		const doiPath = /^\/dois\/(.+)$/.exec(path);
		if (request.method === 'POST' && path === '/dois') return writeRequest(request, null);
		if (request.method === 'PUT' && doiPath) return writeRequest(request, doiPath[1].toLowerCase());
		if (request.method !== 'GET') return problem(405, null, 'Method not allowed.');
		if (path === '/heartbeat') return { status: 200, body: 'OK' };
		if (doiPath) {
			const r = records.get(doiPath[1].toLowerCase());
			return r
				? { status: 200, body: view(doiPath[1].toLowerCase(), r) }
				: problem(404, null, 'The resource you are looking for does not exist.');
		}
		if (/^\/10\.\d+\/.+/.test(path)) return resolve(path.slice(1).toLowerCase());
		return problem(404, null, 'Not found.');
	};
}

function answer(response: ServerResponse, reply: Reply) {
	const headers: Record<string, string> = { 'content-type': JSON_API };
	if (reply.location) headers.location = reply.location;
	response.writeHead(reply.status, headers);
	response.end(reply.body === undefined ? undefined : JSON.stringify(reply.body));
}

/** Starts the fake on the given port, or on any free port when that one is taken. */
export async function startFakeRegistry(options: FakeRegistryOptions): Promise<FakeRegistry> {
	const handle = fakeRegistryHandler(options);
	const server = createServer((request, response) => {
		handle(request).then(
			(reply) => answer(response, reply),
			(error: Reply | Error) =>
				answer(response, 'status' in error ? error : problem(500, null, 'Internal error.'))
		);
	});
	const listen = (port: number) =>
		new Promise<number>((resolve, reject) => {
			server.once('error', reject);
			server.listen(port, '127.0.0.1', () => {
				server.off('error', reject);
				resolve((server.address() as AddressInfo).port);
			});
		});
	const port = await listen(options.port).catch((error: NodeJS.ErrnoException) => {
		if (error.code !== 'EADDRINUSE' && error.code !== 'EACCES') throw error;
		console.warn(`fake DOI registry: port ${options.port} is not available; using a free port`);
		return listen(0);
	});
	console.log(`fake DOI registry: listening on 127.0.0.1:${port}`);
	const close = () =>
		new Promise<void>((done) => {
			server.closeAllConnections();
			server.close(() => done());
		});
	return { url: `http://127.0.0.1:${port}`, port, close };
}
