/**
 * The import graph of src/, read with the TypeScript parser: every import and re-export, every
 * `import(...)` (also `typeof import(...)` in types), type-only ones included, in .ts, .js and
 * the <script> blocks of .svelte files. `$lib` and relative specifiers are resolved the way Vite
 * and TypeScript do (extension optional, `.js` naming a `.ts` file, a folder's index file).
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import ts from 'typescript';

export type Graph = Map<string, Set<string>>;

const SOURCE = /\.(ts|js|svelte)$/;

function filesUnder(root: string, folder: string): string[] {
	return readdirSync(path.join(root, folder), { withFileTypes: true }).flatMap((entry) => {
		const relative = path.posix.join(folder, entry.name);
		if (entry.isDirectory()) return filesUnder(root, relative);
		return SOURCE.test(entry.name) && !entry.name.endsWith('.d.ts') ? [relative] : [];
	});
}

/** The script blocks of a .svelte file (markup cannot import). */
const scriptsOf = (text: string): string =>
	[...text.matchAll(/<script\b[^>]*>([\s\S]*?)<\/script>/g)].map((m) => m[1]).join('\n');

/** Every module specifier the file names. */
export function specifiersOf(file: string, text: string): string[] {
	const code = file.endsWith('.svelte') ? scriptsOf(text) : text;
	const source = ts.createSourceFile(file, code, ts.ScriptTarget.Latest, false, ts.ScriptKind.TS);
	const found: string[] = [];
	const visit = (node: ts.Node): void => {
		if (
			(ts.isImportDeclaration(node) || ts.isExportDeclaration(node)) &&
			node.moduleSpecifier &&
			ts.isStringLiteral(node.moduleSpecifier)
		)
			found.push(node.moduleSpecifier.text);
		else if (
			ts.isCallExpression(node) &&
			node.expression.kind === ts.SyntaxKind.ImportKeyword &&
			node.arguments[0] &&
			ts.isStringLiteralLike(node.arguments[0])
		)
			found.push(node.arguments[0].text);
		else if (
			ts.isImportTypeNode(node) &&
			ts.isLiteralTypeNode(node.argument) &&
			ts.isStringLiteral(node.argument.literal)
		)
			found.push(node.argument.literal.text);
		ts.forEachChild(node, visit);
	};
	visit(source);
	return found;
}

const isFile = (root: string, relative: string) => {
	const full = path.join(root, relative);
	return existsSync(full) && statSync(full).isFile();
};

/** The repo-relative file a specifier names, or null for a package or a generated module. */
export function resolveSpecifier(root: string, from: string, spec: string): string | null {
	let base: string;
	if (spec === '$lib' || spec.startsWith('$lib/')) base = 'src/lib' + spec.slice(4);
	else if (spec.startsWith('./') || spec.startsWith('../'))
		base = path.posix.normalize(path.posix.join(path.posix.dirname(from), spec));
	else return null;
	const candidates = [base, base.replace(/\.js$/, '.ts')];
	for (const end of ['.ts', '.js', '.svelte', '/index.ts', '/index.js'])
		candidates.push(base + end);
	return candidates.find((c) => isFile(root, c)) ?? null;
}

/** file -> the files of src/ it imports (repo-relative paths). */
export function importGraph(root: string, folder = 'src'): Graph {
	const graph: Graph = new Map();
	for (const file of filesUnder(root, folder)) {
		const text = readFileSync(path.join(root, file), 'utf8');
		const targets = specifiersOf(file, text)
			.map((spec) => resolveSpecifier(root, file, spec))
			.filter((target): target is string => target !== null && target.startsWith(folder + '/'));
		graph.set(file, new Set(targets));
	}
	return graph;
}

/** The cycles of the graph: its strongly connected parts of more than one file, or a self-import. */
export function cyclesOf(graph: Graph): string[][] {
	const index = new Map<string, number>();
	const low = new Map<string, number>();
	const stack: string[] = [];
	const onStack = new Set<string>();
	const cycles: string[][] = [];
	let counter = 0;
	// Tarjan's algorithm (SIAM J. Comput. 1, 146, 1972), iterative so deep chains cannot overflow.
	for (const start of graph.keys()) {
		if (index.has(start)) continue;
		const work: [string, Iterator<string>][] = [];
		const enter = (node: string) => {
			index.set(node, counter);
			low.set(node, counter++);
			stack.push(node);
			onStack.add(node);
			work.push([node, (graph.get(node) ?? new Set<string>()).values()]);
		};
		enter(start);
		while (work.length) {
			const [node, next] = work[work.length - 1];
			const step = next.next();
			if (!step.done) {
				const target = step.value;
				if (!index.has(target)) enter(target);
				else if (onStack.has(target)) low.set(node, Math.min(low.get(node)!, index.get(target)!));
				continue;
			}
			work.pop();
			if (work.length) {
				const parent = work[work.length - 1][0];
				low.set(parent, Math.min(low.get(parent)!, low.get(node)!));
			}
			if (low.get(node) !== index.get(node)) continue;
			const part: string[] = [];
			let member: string;
			do {
				member = stack.pop()!;
				onStack.delete(member);
				part.push(member);
			} while (member !== node);
			if (part.length > 1 || graph.get(node)?.has(node)) cycles.push(part.sort());
		}
	}
	return cycles;
}
