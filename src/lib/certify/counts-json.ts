/**
 * JSON counts form (product.md): `{"dimension": d, "tables": [{"basis": t, "counts": [[…d×d…]]}]}`,
 * optionally with `accidentals` and `duration_s` matrices of the same shape in a table, and a
 * top-level `"fourier": "cyclic" | "field"` declaring which Fourier basis basis 1 is.
 * Errors name the JSON path and the line and column where the offending value starts.
 * Read in two passes of jsonc-parser's event reader, never as a tree: memory stays near the
 * text itself plus the tables (json-scan.ts, json-tables.ts).
 */
import { printParseErrorCode } from 'jsonc-parser';
import { fourierProblem, isFourierConvention } from './bases';
import {
	checkDimension,
	InputError,
	decodeCountsText,
	type CountsDataset,
	type CountTable
} from './counts';
import { TableBudget } from './counts-budget';
import { requireShallowJson } from './json-guards';
import { DIGITS_ONLY } from './json-matrix';
import { digitsOnly, scanRoot, type Spot } from './json-scan';
import { readTables, type Fail } from './json-tables';

const ROOT_KEYS = new Set(['dimension', 'tables', 'fourier']);

/** Line and column (1-based) of an offset, counting lines by LF without copying the text. */
function locator(text: string) {
	return (offset: number) => {
		let line = 1;
		let lineStart = 0;
		for (let at = text.indexOf('\n'); at >= 0 && at < offset; at = text.indexOf('\n', at + 1)) {
			line++;
			lineStart = at + 1;
		}
		return { line, column: offset - lineStart + 1 };
	};
}

export function parseCountsJson(
	input: Uint8Array | string,
	dimension?: number,
	budget = new TableBudget()
): CountsDataset {
	const text = decodeCountsText(input);
	requireShallowJson(text);
	const where = locator(text);
	const fail: Fail = (offset, path, message) => {
		const at = offset === undefined ? undefined : where(offset);
		throw new InputError(`${path}: ${message}`, at?.line, at?.column);
	};
	const scan = scanRoot(text, ROOT_KEYS);
	if (scan.error || !scan.root) {
		const at = scan.error ? where(scan.error.offset) : undefined;
		const code = scan.error ? printParseErrorCode(scan.error.code) : 'no value';
		throw new InputError(`not valid JSON (${code})`, at?.line, at?.column);
	}
	const root = scan.root;
	if (root.kind !== 'object')
		fail(root.offset, '$', 'expected an object with "dimension" and "tables"');
	if (scan.unknown) fail(scan.unknown.offset, `$.${scan.unknown.key}`, 'unknown field');
	const d = readDimension(text, scan.fields.get('dimension'), root, fail, dimension);
	const declaredFourier = readFourier(scan.fields.get('fourier'), d, where, fail);
	const tablesNode = scan.fields.get('tables');
	if (!tablesNode || tablesNode.kind !== 'array' || scan.tableCount === 0)
		fail((tablesNode ?? root).offset, '$.tables', 'expected a non-empty array of tables');
	const tables = new Map<number, CountTable>();
	readTables({ text, d, fail, where, tables }, budget);
	const sorted = [...tables.values()].sort((x, y) => x.basis - y.basis);
	return declaredFourier
		? { dimension: d, tables: sorted, declaredFourier }
		: { dimension: d, tables: sorted };
}

function readDimension(
	text: string,
	node: Spot | undefined,
	root: Spot,
	fail: Fail,
	requested?: number
): number {
	if (!node) return fail(root.offset, '$', 'missing field "dimension"');
	// Whole numbers are written as digits only, as in CSV: `5.0`, `5e0` and `-0` are refused.
	if (typeof node.value === 'number' && !digitsOnly(text, node.offset, node.length)) {
		const written = text.slice(node.offset, node.offset + node.length);
		fail(
			node.offset,
			'$.dimension',
			`expected a non-negative whole number, got ${written}${DIGITS_ONLY}`
		);
	}
	let d: number;
	try {
		d = checkDimension(node.value, '$.dimension');
	} catch (error) {
		return fail(
			node.offset,
			'$.dimension',
			(error as Error).message.replace(/^\$\.dimension /, '')
		);
	}
	if (requested !== undefined && requested !== d)
		fail(node.offset, '$.dimension', `the file says ${d} but dimension ${requested} was requested`);
	return d;
}

/** The optional top-level `"fourier"`: one of the two conventions, and possible in dimension d. */
function readFourier(
	node: Spot | undefined,
	d: number,
	where: (offset: number) => { line: number; column: number },
	fail: Fail
): CountsDataset['declaredFourier'] {
	if (!node) return undefined;
	const convention = node.value;
	if (!isFourierConvention(convention))
		fail(
			node.offset,
			'$.fourier',
			`expected "cyclic" or "field", got ${JSON.stringify(convention ?? null)}`
		);
	const problem = fourierProblem(d, convention);
	if (problem) fail(node.offset, '$.fourier', problem);
	return { convention, ...where(node.offset) };
}
