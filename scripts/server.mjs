// npm start: adapter-node's own server (build/index.js, made by `npm run build`), unchanged — its
// environment variables (HOST, PORT, ORIGIN, BODY_SIZE_LIMIT, SHUTDOWN_TIMEOUT, …), its graceful
// stop on SIGTERM/SIGINT and 'sveltekit:shutdown' — plus the security headers on the answers that
// never reach Kit's handle hook: the files it serves itself (/_app/…, static/).
import { server } from '../build/index.js';
import { securityHeadersFor } from '../src/lib/server/http/security-headers.js';

/**
 * @param {import('node:http').IncomingMessage} request
 * @param {import('node:http').ServerResponse} response
 */
function setSecurityHeaders(request, response) {
	for (const [name, value] of Object.entries(securityHeadersFor(request.url ?? '/')))
		response.setHeader(name, value);
}

// First of the 'request' listeners, so set before the file server or Kit writes the head (Kit
// then sets the same names again from the hook). No request is read before this line runs:
// index.js only starts listening, and this module's body follows it within the same turn.
server.server.prependListener('request', setSecurityHeaders);
