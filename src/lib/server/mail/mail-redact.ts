/**
 * Links that open something (a reset, a confirmation, an invitation, a share, a review link) are
 * removed from a message's stored copy once it is delivered or given up: the recipient has it,
 * and the outbox (and so every backup) keeps none that works. Which paths carry a secret is
 * SECRET_PATHS, the same list that sets their referrer policy.
 */
import { SECRET_PATHS } from '../http/security-headers.js';

export const REMOVED_LINK = '[link removed once sent]';

const secretPath = SECRET_PATHS.map((p) => p.replaceAll('/', '\\/')).join('|');
/** An absolute address on any host whose path starts with a secret-bearing segment. */
const SECRET_URL = new RegExp(`https?://[^\\s"'<>/]+/(?:${secretPath})/[^\\s"'<>]+`, 'g');
const SECRET_HREF = new RegExp(`href="https?://[^"/]+/(?:${secretPath})/[^"]*"`, 'g');

export function redactSecretLinks(
	mail: { text: string; html: string },
	words = REMOVED_LINK
): { text: string; html: string } {
	return {
		text: mail.text.replace(SECRET_URL, words),
		html: mail.html.replace(SECRET_HREF, 'href="#"').replace(SECRET_URL, words)
	};
}
