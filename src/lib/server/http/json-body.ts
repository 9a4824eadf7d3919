/**
 * JSON request bodies for the API: the declared type must be JSON (415 otherwise), and numbers
 * are taken as written — an integer-valued number written with a point or an exponent (`5.0`,
 * `1e2`, `-0`) is refused naming its field, as the counts files' rule has it, never coerced.
 */
import { createScanner } from 'jsonc-parser';
import { ApiError } from './problems';

/** The largest JSON body any endpoint reads: its fields are short, its lists small. */
export const JSON_BODY_LIMIT = 1024 * 1024;

const JSON_TYPE = /^application\/json\s*(;\s*charset\s*=\s*"?utf-8"?\s*)?$/i;
const INTEGER_TEXT = /^(0|-?[1-9]\d*)$/;

/** Whether a Content-Type header names JSON (a UTF-8 charset may come with it). */
export const isJsonType = (header: string | null): boolean =>
	header !== null && JSON_TYPE.test(header.trim());

export const notJson = (header: string | null) =>
	new ApiError(
		415,
		'unsupported_media_type',
		`Send the body as JSON with "Content-Type: application/json"${header ? ` (not ${header.split(';')[0].trim()})` : ''}.`
	);

// jsonc-parser's SyntaxKind is a const enum, which isolated modules cannot read.
const OPEN_BRACE = 1;
const CLOSE_BRACE = 2;
const OPEN_BRACKET = 3;
const CLOSE_BRACKET = 4;
const COMMA = 5;
const STRING = 10;
const NUMBER = 11;
const EOF = 17;

type Frame = { key: string | null } | { index: number };

/**
 * Where the first number sits whose value is whole but whose text is not an integer (`5.0`,
 * `1e2`, `-0`), and that text; null when there is none. Runs on text JSON.parse accepted, as a
 * flat scan (no recursion, so deep nesting cannot overflow it).
 */
export function looseInteger(text: string): { path: (string | number)[]; written: string } | null {
	const scanner = createScanner(text, true);
	const frames: Frame[] = [];
	for (let token = scanner.scan(); token !== EOF; token = scanner.scan()) {
		const top = frames.at(-1);
		if (token === OPEN_BRACE) frames.push({ key: null });
		else if (token === OPEN_BRACKET) frames.push({ index: 0 });
		else if (token === CLOSE_BRACE || token === CLOSE_BRACKET) frames.pop();
		else if (token === COMMA && top) {
			if ('index' in top) top.index++;
			else top.key = null;
		} else if (token === STRING && top && 'key' in top && top.key === null)
			top.key = scanner.getTokenValue();
		else if (token === NUMBER) {
			const written = scanner.getTokenValue();
			const value = Number(written);
			if (Number.isInteger(value) && !(INTEGER_TEXT.test(written) && !Object.is(value, -0)))
				return { path: frames.map((f) => ('index' in f ? f.index : (f.key ?? ''))), written };
		}
	}
	return null;
}

/** The parsed body; 400 for text that is not JSON or a whole number written loosely. */
export function jsonValue(text: string): unknown {
	let value: unknown;
	try {
		value = JSON.parse(text);
	} catch {
		throw new ApiError(400, 'bad_input', 'The body is not valid JSON.');
	}
	const loose = looseInteger(text);
	if (loose) {
		const where = loose.path.join('.') || 'The body';
		throw new ApiError(
			400,
			'bad_input',
			`${where}: write a whole number as an integer (${Number(loose.written)}), not ${loose.written}.`,
			loose.path.length ? String(loose.path[0]) : undefined
		);
	}
	return value;
}
