// Plain JavaScript: scripts/server.mjs reads it at run time, where there is no TypeScript loader.

/** The first path segments of addresses that carry a secret: review, share and account links. */
export const SECRET_PATHS = ['review', 'api/v1/review', 'invite', 'verify', 'shared', 'reset'];

/** Addresses that carry a secret: the referee's link and the one-use account links. */
export const SECRET_IN_PATH = new RegExp(
	`^/(${SECRET_PATHS.map((p) => p.replaceAll('/', '\\/')).join('|')})/[^/]`
);

/**
 * The headers every answer carries, Kit's (response-headers.ts) and the files adapter-node serves
 * itself (scripts/server.mjs): no type sniffing, no framing, and a referrer policy.
 * @param {string} path the request's path; a query after it changes nothing
 * @returns {Record<string, string>}
 */
export function securityHeadersFor(path) {
	return {
		'x-content-type-options': 'nosniff',
		'x-frame-options': 'DENY',
		// A review or invitation link never travels to another site in a Referer. Not no-referrer:
		// that makes the browser send `Origin: null` with the page's own forms, which we refuse.
		'referrer-policy': SECRET_IN_PATH.test(path) ? 'same-origin' : 'strict-origin-when-cross-origin'
	};
}
