/** Canonical JSON (RFC 8785, JCS): sorted keys, ECMAScript number form, no whitespace. */
import serialize from 'canonicalize';

export function canonicalJson(value: unknown): string {
	const text = serialize(value);
	if (text === undefined) throw new Error('canonical JSON: the value has no JSON form');
	return text;
}

/** Parses text that must already be in canonical form; null when it is not JSON or not canonical. */
export function parseCanonical(text: string): unknown {
	let value: unknown;
	try {
		value = JSON.parse(text);
	} catch {
		return null;
	}
	return canonicalJson(value) === text ? value : null;
}

/** A value as a stored JSON row gives it back: undefined fields gone, non-finite numbers null. */
export function jsonRoundTrip<T>(value: T): T {
	return JSON.parse(JSON.stringify(value)) as T;
}
