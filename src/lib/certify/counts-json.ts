/**
 * JSON counts form (product.md): `{"dimension": d, "tables": [{"basis": t, "counts": [[…d×d…]]}]}`,
 * optionally with `accidentals` and `duration_s` matrices of the same shape in a table, and a
 * top-level `"fourier": "cyclic" | "field"` declaring which Fourier basis basis 1 is.
 * Errors name the JSON path and the line and column where the offending value starts.
 */
import { parseTree, printParseErrorCode, type Node, type ParseError } from 'jsonc-parser';
import { fourierProblem, isFourierConvention } from './bases';
import {
	checkBasis,
	checkDimension,
	InputError,
	decodeCountsText,
	emptyTable,
	type CountsDataset,
	type CountTable,
	WHOLE_NUMBER_TEXT
} from './counts';
import { numberText, requireShallowJson } from './json-guards';

const TABLE_KEYS = new Set(['basis', 'counts', 'accidentals', 'duration_s']);

function locator(text: string) {
	return (offset: number) => {
		const before = text.slice(0, offset);
		const line = before.split('\n').length;
		return { line, column: offset - before.lastIndexOf('\n') };
	};
}

export function parseCountsJson(input: Uint8Array | string, dimension?: number): CountsDataset {
	const text = decodeCountsText(input);
	requireShallowJson(text);
	const where = locator(text);
	const fail = (node: Node | undefined, path: string, message: string): never => {
		const at = node ? where(node.offset) : undefined;
		throw new InputError(`${path}: ${message}`, at?.line, at?.column);
	};
	// Whole numbers are written as digits only, as in CSV: `5.0`, `5e0` and `-0` are refused.
	const requireDigits = (node: Node | undefined, path: string) => {
		const written = node?.type === 'number' ? numberText(text, node) : null;
		if (written !== null && !WHOLE_NUMBER_TEXT.test(written))
			fail(node, path, `expected a non-negative whole number, got ${written}${DIGITS_ONLY}`);
	};
	const errors: ParseError[] = [];
	const root = parseTree(text, errors, { disallowComments: true, allowTrailingComma: false });
	if (errors.length || !root) {
		const first = errors[0];
		const at = first ? where(first.offset) : undefined;
		throw new InputError(
			`not valid JSON (${first ? printParseErrorCode(first.error) : 'no value'})`,
			at?.line,
			at?.column
		);
	}
	if (root.type !== 'object') fail(root, '$', 'expected an object with "dimension" and "tables"');
	const member = (node: Node, key: string) =>
		node.children?.find((p) => p.children?.[0].value === key)?.children?.[1];
	for (const property of root.children ?? []) {
		const key = property.children?.[0].value;
		if (!['dimension', 'tables', 'fourier'].includes(key))
			fail(property, `$.${key}`, 'unknown field');
	}
	const dimNode = member(root, 'dimension');
	if (!dimNode) fail(root, '$', 'missing field "dimension"');
	requireDigits(dimNode, '$.dimension');
	let d: number;
	try {
		d = checkDimension(dimNode!.value, '$.dimension');
	} catch (error) {
		return fail(dimNode, '$.dimension', (error as Error).message.replace(/^\$\.dimension /, ''));
	}
	if (dimension !== undefined && dimension !== d) {
		fail(dimNode, '$.dimension', `the file says ${d} but dimension ${dimension} was requested`);
	}
	const declaredFourier = readFourier(member(root, 'fourier'), d, where, fail);
	const tablesNode = member(root, 'tables');
	if (!tablesNode || tablesNode.type !== 'array' || !tablesNode.children?.length) {
		fail(tablesNode ?? root, '$.tables', 'expected a non-empty array of tables');
	}
	const tables = new Map<number, CountTable>();
	tablesNode!.children!.forEach((tableNode, i) => {
		const path = `$.tables[${i}]`;
		if (tableNode.type !== 'object')
			fail(tableNode, path, 'expected an object with "basis" and "counts"');
		for (const property of tableNode.children ?? []) {
			const key = property.children?.[0].value;
			if (!TABLE_KEYS.has(key)) fail(property, `${path}.${key}`, 'unknown field');
		}
		const basisNode = member(tableNode, 'basis');
		requireDigits(basisNode, `${path}.basis`);
		const basis = basisNode?.value;
		if (typeof basis !== 'number' || !Number.isInteger(basis) || basis < 0) {
			fail(basisNode ?? tableNode, `${path}.basis`, 'expected a non-negative whole number');
		}
		const at = where(basisNode!.offset);
		checkBasis(d, basis, `${path}.basis`, at.line, at.column);
		if (tables.has(basis)) fail(basisNode, `${path}.basis`, `basis ${basis} appears twice`);
		const accNode = member(tableNode, 'accidentals');
		const durNode = member(tableNode, 'duration_s');
		const table = emptyTable(d, basis, { accidentals: !!accNode, durations: !!durNode });
		const countsNode = member(tableNode, 'counts');
		if (!countsNode) fail(tableNode, path, 'missing field "counts"');
		readMatrix(
			countsNode!,
			`${path}.counts`,
			d,
			fail,
			(cell, v) => (table.counts[cell] = v),
			'whole',
			text
		);
		table.present.fill(1);
		if (accNode)
			readMatrix(
				accNode,
				`${path}.accidentals`,
				d,
				fail,
				(c, v) => (table.accidentals![c] = v),
				'nonnegative',
				text
			);
		if (durNode)
			readMatrix(
				durNode,
				`${path}.duration_s`,
				d,
				fail,
				(c, v) => (table.durations![c] = v),
				'positive',
				text
			);
		tables.set(basis, table);
	});
	const sorted = [...tables.values()].sort((x, y) => x.basis - y.basis);
	return declaredFourier
		? { dimension: d, tables: sorted, declaredFourier }
		: { dimension: d, tables: sorted };
}

type Fail = (node: Node | undefined, path: string, message: string) => never;

const DIGITS_ONLY = ' (written with digits only, as in CSV)';

const EXPECTED = {
	whole: 'a non-negative whole number',
	positive: 'a positive number',
	nonnegative: 'a non-negative number'
};

/** One cell: counts as digits only (the CSV rule); other values any number, never negative (`-0`). */
function cellOk(v: unknown, written: string, kind: keyof typeof EXPECTED): boolean {
	if (typeof v !== 'number' || !Number.isFinite(v) || written.startsWith('-')) return false;
	if (kind === 'whole') return WHOLE_NUMBER_TEXT.test(written) && Number.isSafeInteger(v);
	return kind === 'positive' ? v > 0 : v >= 0;
}

function readMatrix(
	node: Node,
	path: string,
	d: number,
	fail: Fail,
	store: (cell: number, v: number) => void,
	kind: keyof typeof EXPECTED,
	text: string
) {
	if (node.type !== 'array' || node.children?.length !== d) fail(node, path, `expected ${d} rows`);
	node.children!.forEach((row, a) => {
		if (row.type !== 'array' || row.children?.length !== d)
			fail(row, `${path}[${a}]`, `expected ${d} entries`);
		row.children!.forEach((entry, b) => {
			const written = entry.type === 'number' ? numberText(text, entry) : '';
			if (!cellOk(entry.value, written, kind))
				fail(
					entry,
					`${path}[${a}][${b}]`,
					`expected ${EXPECTED[kind]}, got ${written || JSON.stringify(entry.value ?? null)}` +
						(kind === 'whole' ? DIGITS_ONLY : '')
				);
			store(a * d + b, entry.value);
		});
	});
}

/** The optional top-level `"fourier"`: one of the two conventions, and possible in dimension d. */
function readFourier(
	node: Node | undefined,
	d: number,
	where: (offset: number) => { line: number; column: number },
	fail: Fail
): CountsDataset['declaredFourier'] {
	if (!node) return undefined;
	const convention = node.value;
	if (!isFourierConvention(convention))
		fail(
			node,
			'$.fourier',
			`expected "cyclic" or "field", got ${JSON.stringify(convention ?? null)}`
		);
	const problem = fourierProblem(d, convention);
	if (problem) fail(node, '$.fourier', problem);
	return { convention, ...where(node.offset) };
}
