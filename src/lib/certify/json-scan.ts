/**
 * The first pass over JSON counts text, with jsonc-parser's event reader (no tree is built: a
 * tree of a 20 MiB file took a gigabyte): finds the first syntax error, the top-level fields
 * (the first of each name, as a tree lookup would) and whether "tables" holds anything.
 */
import { visit, type ParseErrorCode } from 'jsonc-parser';

/** Where a JSON value starts, what kind it is and, for a literal, its value. */
export interface Spot {
	offset: number;
	length: number;
	kind: 'object' | 'array' | 'literal';
	value?: unknown;
}

export interface RootScan {
	error?: { code: ParseErrorCode; offset: number };
	root?: Spot;
	/** The first top-level key that is not one of `known`. */
	unknown?: { key: string; offset: number };
	fields: Map<string, Spot>;
	/** Values directly inside the first "tables" array. */
	tableCount: number;
}

export const JSON_OPTIONS = { disallowComments: true, allowTrailingComma: false };

export function scanRoot(text: string, known: Set<string>): RootScan {
	const scan: RootScan = { fields: new Map(), tableCount: 0 };
	let depth = 0;
	let key: string | null = null;
	let tablesDepth = -1;
	const value = (kind: Spot['kind'], offset: number, length: number, v?: unknown) => {
		if (depth === 0) scan.root = { kind, offset, length, value: v };
		else if (depth === 1 && key !== null) {
			if (!scan.fields.has(key)) {
				scan.fields.set(key, { kind, offset, length, value: v });
				if (key === 'tables' && kind === 'array') tablesDepth = depth + 1;
			}
			key = null;
		} else if (depth === tablesDepth) scan.tableCount++;
	};
	visit(
		text,
		{
			onObjectBegin: (offset, length) => void (value('object', offset, length), depth++),
			onArrayBegin: (offset, length) => void (value('array', offset, length), depth++),
			onObjectEnd: () => void depth--,
			onArrayEnd: () => {
				if (depth-- === tablesDepth) tablesDepth = -1;
			},
			onLiteralValue: (v, offset, length) => value('literal', offset, length, v),
			onObjectProperty: (property, offset) => {
				if (depth !== 1) return;
				key = property;
				if (!known.has(property) && !scan.unknown) scan.unknown = { key: property, offset };
			},
			onError: (code, offset) => void (scan.error ??= { code, offset })
		},
		JSON_OPTIONS
	);
	return scan;
}

/** Digits only, read in place (no string made for each of millions of cells). */
export function digitsOnly(text: string, offset: number, length: number): boolean {
	if (length === 0) return false;
	for (let i = offset; i < offset + length; i++) {
		const c = text.charCodeAt(i);
		if (c < 48 || c > 57) return false;
	}
	return true;
}
