/**
 * The local fake DOI registry: a real HTTP server on 127.0.0.1 answering the part of DataCite's
 * REST API Rankseal uses (POST /dois, PUT and GET /dois/{doi}, Basic auth, 4xx with JSON:API
 * errors) and a resolver (GET /{doi} redirects to the registered URL), for development, the demo
 * and the tests. Records persist in a JSON file when one is given (fake-registry-store.ts).
 */
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { problem, registryStore, type Reply } from './fake-registry-store';

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

const MAX_BODY = 1024 * 1024;
const JSON_API = 'application/vnd.api+json';

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

type Body = { data?: { type?: string; attributes?: Record<string, unknown> } };

export function fakeRegistryHandler(options: FakeRegistryOptions) {
	const store = registryStore(options.file);
	const expected = `Basic ${Buffer.from(`${options.user}:${options.password}`).toString('base64')}`;

	/** POST /dois (doiInPath null) or PUT /dois/{doi}: credentials, media type, body, prefix. */
	async function writeRequest(request: IncomingMessage, doiInPath: string | null): Promise<Reply> {
		if (request.headers.authorization !== expected) return problem(401, null, 'Bad credentials.');
		if (!(request.headers['content-type'] ?? '').startsWith(JSON_API))
			return problem(415, null, `Send ${JSON_API}.`);
		const data = ((await bodyOf(request)) as Body | null)?.data;
		const attributes = data?.attributes;
		if (data?.type !== 'dois' || typeof attributes !== 'object' || !attributes)
			return problem(400, 'data', 'Expected { data: { type: "dois", attributes } }.');
		const doi = String(doiInPath ?? attributes.doi ?? '').toLowerCase();
		if (!doi.startsWith(`${options.prefix.toLowerCase()}/`))
			return problem(403, 'doi', `This repository may only use the prefix ${options.prefix}.`);
		return store.write(doi, attributes, doiInPath === null);
	}

	return async (request: IncomingMessage): Promise<Reply> => {
		const path = decodeURIComponent(new URL(request.url ?? '/', 'http://fake').pathname);
		const doiPath = /^\/dois\/(.+)$/.exec(path);
		const doi = doiPath?.[1].toLowerCase() ?? null;
		if (request.method === 'POST' && path === '/dois') return writeRequest(request, null);
		if (request.method === 'PUT' && doi) return writeRequest(request, doi);
		if (request.method !== 'GET') return problem(405, null, 'Method not allowed.');
		if (path === '/heartbeat') return { status: 200, body: 'OK' };
		if (doi) return store.read(doi);
		if (/^\/10\.\d+\/.+/.test(path)) return store.resolve(path.slice(1).toLowerCase());
		return problem(404, null, 'Not found.');
	};
}

function answer(response: ServerResponse, reply: Reply) {
	const headers: Record<string, string> = { 'content-type': JSON_API };
	if (reply.location) headers.location = reply.location;
	response.writeHead(reply.status, headers);
	response.end(reply.body === undefined ? undefined : JSON.stringify(reply.body));
}

function listen(server: ReturnType<typeof createServer>, port: number): Promise<number> {
	return new Promise<number>((resolve, reject) => {
		server.once('error', reject);
		server.listen(port, '127.0.0.1', () => {
			server.off('error', reject);
			resolve((server.address() as AddressInfo).port);
		});
	});
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
	const port = await listen(server, options.port).catch((error: NodeJS.ErrnoException) => {
		if (error.code !== 'EADDRINUSE' && error.code !== 'EACCES') throw error;
		console.warn(`fake DOI registry: port ${options.port} is not available; using a free port`);
		return listen(server, 0);
	});
	console.log(`fake DOI registry: listening on 127.0.0.1:${port}`);
	const close = () =>
		new Promise<void>((done) => {
			server.closeAllConnections();
			server.close(() => done());
		});
	return { url: `http://127.0.0.1:${port}`, port, close };
}
