/**
 * Checks on JSON counts text that the tree parser cannot make: how deep it nests (jsonc-parser
 * builds its tree recursively, so 100 000 open brackets overflow the stack) and how a number is
 * written (the tree holds only its value, so `1e3`, `1000.0` and `-0` would pass as integers).
 */
import { createScanner, type Node } from 'jsonc-parser';
import { InputError } from './counts';

/** The counts form needs 5 levels ({ tables [ { counts [ [ ); anything far deeper is not counts. */
export const MAX_JSON_DEPTH = 32;

// jsonc-parser's SyntaxKind is a const enum, which isolated modules cannot read.
const OPEN_BRACE = 1;
const CLOSE_BRACE = 2;
const OPEN_BRACKET = 3;
const CLOSE_BRACKET = 4;
const EOF = 17;

/** Throws InputError at the first bracket that opens level MAX_JSON_DEPTH + 1. */
export function requireShallowJson(text: string): void {
	const scanner = createScanner(text, true);
	let depth = 0;
	for (let token = scanner.scan(); token !== EOF; token = scanner.scan()) {
		if (token === OPEN_BRACE || token === OPEN_BRACKET) {
			if (++depth > MAX_JSON_DEPTH)
				throw new InputError(
					`the JSON nests deeper than ${MAX_JSON_DEPTH} levels; a counts file needs 5`,
					scanner.getTokenStartLine() + 1,
					scanner.getTokenStartCharacter() + 1
				);
		} else if (token === CLOSE_BRACE || token === CLOSE_BRACKET) depth--;
	}
}

/** The number exactly as the file writes it. */
export const numberText = (text: string, node: Node): string =>
	text.slice(node.offset, node.offset + node.length);
