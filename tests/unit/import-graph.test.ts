/**
 * The house plan (docs/architecture.md), checked on the code: no import cycle anywhere under
 * src/ (type-only imports included: a cycle of types still ties two modules into one), the
 * lower layer (core/, storage/, access/) imports nothing from the rooms above it, only the top
 * floor imports app/, and the engine stays pure.
 * IMPORT_GRAPH_ROOT points the check at another checkout (e.g. an older tree, to see it fail).
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { cyclesOf, importGraph, resolveSpecifier, specifiersOf, type Graph } from '../import-graph';

const ROOT =
	process.env.IMPORT_GRAPH_ROOT ??
	path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const SERVER = 'src/lib/server/';

/** What each room of the lower layer may import from src/lib/server/ (anything outside it is fine). */
const LOWER_LAYER: Record<string, string[]> = {
	core: ['core', 'db'],
	storage: ['core', 'storage', 'db'],
	access: ['access', 'core', 'db']
};

/** The start-up room is the top floor of the server: only the web edge and itself import it. */
const APP_IMPORTERS = ['app', 'http'];

const roomOf = (file: string): string | null =>
	file.startsWith(SERVER) ? file.slice(SERVER.length).split('/')[0] : null;

function upwardImports(graph: Graph): string[] {
	const found: string[] = [];
	for (const [file, targets] of graph) {
		const from = roomOf(file);
		if (from === null) continue;
		const allowed = LOWER_LAYER[from];
		for (const target of targets) {
			const room = roomOf(target);
			if (room === null) continue;
			const low = allowed && !allowed.includes(room);
			if (low || (room === 'app' && !APP_IMPORTERS.includes(from)))
				found.push(`${file} -> ${target}`);
		}
	}
	return found;
}

/** The engine is pure: nothing outside src/lib/certify/ (packages are not in the graph). */
const engineImports = (graph: Graph): string[] =>
	[...graph]
		.filter(([file]) => file.startsWith('src/lib/certify/'))
		.flatMap(([file, targets]) => [...targets].map((target) => `${file} -> ${target}`))
		.filter((edge) => !edge.split(' -> ')[1].startsWith('src/lib/certify/'));

describe('the import graph reader', () => {
	it('finds every kind of specifier, type-only and svelte scripts included', () => {
		const text = [
			"import a from './a';",
			"import type { B } from '$lib/b';",
			"export { c } from '../c.js';",
			"export * from './d';",
			"const e = await import('./e');",
			"type F = typeof import('./f').F;",
			"import 'side-effect';"
		].join('\n');
		expect(specifiersOf('x.ts', text)).toEqual([
			'./a',
			'$lib/b',
			'../c.js',
			'./d',
			'./e',
			'./f',
			'side-effect'
		]);
		const svelte = `<script lang="ts">\n\timport G from './G.svelte';\n</script>\n<p>import x from 'no'</p>`;
		expect(specifiersOf('y.svelte', svelte)).toEqual(['./G.svelte']);
	});

	it('resolves $lib, .js naming a .ts file, and folder index files; packages are outside', () => {
		const from = 'src/lib/server/http/api.ts';
		expect(resolveSpecifier(ROOT, from, '../db')).toBe('src/lib/server/db/index.ts');
		expect(resolveSpecifier(ROOT, from, '$lib/certify')).toBe('src/lib/certify/index.ts');
		expect(resolveSpecifier(ROOT, from, './problems.js')).toBe('src/lib/server/http/problems.ts');
		expect(resolveSpecifier(ROOT, from, 'zod')).toBeNull();
	});

	it('finds a cycle and a self-import, and nothing in a graph without one', () => {
		const graph: Graph = new Map([
			['a', new Set(['b'])],
			['b', new Set(['c', 'd'])],
			['c', new Set(['a'])],
			['d', new Set(['d'])],
			['e', new Set(['a'])]
		]);
		expect(cyclesOf(graph)).toEqual(expect.arrayContaining([['a', 'b', 'c'], ['d']]));
		expect(cyclesOf(graph)).toHaveLength(2);
		const tree: Graph = new Map([
			['a', new Set(['b', 'c'])],
			['b', new Set(['c'])],
			['c', new Set()]
		]);
		expect(cyclesOf(tree)).toEqual([]);
	});
});

describe('the code under src/', () => {
	const graph = importGraph(ROOT);

	it('is read whole (every room of the server is in the graph)', () => {
		const rooms = new Set([...graph.keys()].map(roomOf).filter(Boolean));
		for (const room of ['core', 'storage', 'http', 'checks', 'certificates', 'claims'])
			expect(rooms).toContain(room);
	});

	it('has no import cycle', () => {
		expect(cyclesOf(graph).map((cycle) => cycle.join(' <-> '))).toEqual([]);
	});

	it('has core/, storage/ and access/ import nothing above them, and app/ imported from the top only', () => {
		expect(upwardImports(graph)).toEqual([]);
	});

	it('has the engine (src/lib/certify/) import nothing outside itself', () => {
		expect(engineImports(graph)).toEqual([]);
	});
});
