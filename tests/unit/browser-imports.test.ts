/**
 * Code the browser loads never imports from $lib/server, not even types: every Svelte component
 * and page, every universal +page.ts/+layout.ts, and the view types in src/lib/views. Kit refuses
 * server-only modules in browser code at build time only for values (SvelteKit docs, "Server-only
 * modules"); this test holds type imports to the same rule without running svelte-check.
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = path.resolve(import.meta.dirname, '../..');
const SERVER = path.join(ROOT, 'src/lib/server');

function filesUnder(folder: string): string[] {
	return readdirSync(folder, { withFileTypes: true }).flatMap((entry) => {
		const full = path.join(folder, entry.name);
		return entry.isDirectory() ? filesUnder(full) : [full];
	});
}

/** Files the browser may load: .svelte anywhere, universal route modules, and src/lib/views. */
const browserFiles = (): string[] => [
	...filesUnder(path.join(ROOT, 'src')).filter(
		(f) => f.endsWith('.svelte') || /\/\+(page|layout)\.ts$/.test(f)
	),
	...filesUnder(path.join(ROOT, 'src/lib/views')).filter((f) => f.endsWith('.ts'))
];

/** Every module specifier a file imports or re-exports, static or dynamic. */
export function specifiers(text: string): string[] {
	const found: string[] = [];
	const patterns = [
		/\b(?:import|export)\s[^'"`;]*?\bfrom\s*['"]([^'"]+)['"]/g,
		/\bimport\s*['"]([^'"]+)['"]/g,
		/\bimport\s*\(\s*['"]([^'"]+)['"]\s*\)/g
	];
	for (const pattern of patterns) for (const m of text.matchAll(pattern)) found.push(m[1]);
	return found;
}

/** Whether a specifier in `file` reaches into src/lib/server. */
export function reachesServer(file: string, specifier: string): boolean {
	if (specifier === '$lib/server' || specifier.startsWith('$lib/server/')) return true;
	if (!specifier.startsWith('.')) return false;
	const target = path.resolve(path.dirname(file), specifier);
	return target === SERVER || target.startsWith(SERVER + path.sep);
}

describe('browser code and $lib/server', () => {
	it('finds the imports it looks for (the check itself can fail)', () => {
		const sample = `import type { X } from '$lib/server/problems';\nimport { y } from '../server/z';`;
		const file = path.join(ROOT, 'src/lib/components/Sample.svelte');
		expect(specifiers(sample).filter((s) => reachesServer(file, s))).toHaveLength(2);
	});

	it('has no browser-loaded file that imports from $lib/server', () => {
		const files = browserFiles();
		expect(files.length).toBeGreaterThan(50);
		const offenders = files.flatMap((file) =>
			specifiers(readFileSync(file, 'utf8'))
				.filter((s) => reachesServer(file, s))
				.map((s) => `${path.relative(ROOT, file)}: ${s}`)
		);
		expect(offenders).toEqual([]);
	});
});
