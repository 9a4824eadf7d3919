/**
 * rankseal keys:rotate — makes a new service signing key and makes it current. Earlier keys stay
 * listed (and keep verifying the certificates they signed).
 *   npm run --silent keys:rotate
 */
import { publishedKeys, rotateServiceKey } from '../lib/server/evidence/keys';

try {
	const before = publishedKeys().at(-1)!;
	const key = rotateServiceKey();
	console.log(`signing key rotated: ${before.id} -> ${key.id}`);
	console.log(`${publishedKeys().length} keys listed; certificates signed earlier stay valid.`);
} catch (error) {
	console.error(`keys:rotate failed: ${(error as Error).message}`);
	process.exitCode = 1;
}
