/**
 * Every way into the app, read from src/routes: "GET /path" for each page, "POST /path?/name" for
 * each form action (the default action as "POST /path"), "METHOD /path" for each +server.ts
 * handler. Route groups like (app) are dropped; parameters stay as [name].
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';

const ROOT = path.resolve('src/routes');
const METHODS = /export\s+(?:const|async\s+function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b/g;

const urlOf = (folder: string) =>
	'/' +
	folder
		.split(path.sep)
		.filter((part) => part && part !== '.' && !/^\(.*\)$/.test(part))
		.join('/');

/** The keys of `export const actions = { … }`: the entries one tab in, up to its closing brace. */
export function actionNames(source: string): string[] {
	const start = source.search(/export\s+const\s+actions\b/);
	if (start < 0) return [];
	const body = source.slice(start).split(/^\};?\s*$/m)[0];
	return [...body.matchAll(/^\t(?:async\s+)?(\w+)\s*(?::|\()/gm)].map((m) => m[1]);
}

export function discoverRoutes(): string[] {
	const files = readdirSync(ROOT, { recursive: true, encoding: 'utf8' });
	const keys: string[] = [];
	for (const file of files) {
		const name = path.basename(file);
		const url = urlOf(path.dirname(file));
		if (name === '+page.svelte') keys.push(`GET ${url}`);
		if (name === '+page.server.ts') {
			const source = readFileSync(path.join(ROOT, file), 'utf8');
			for (const action of actionNames(source))
				keys.push(action === 'default' ? `POST ${url}` : `POST ${url}?/${action}`);
		}
		if (name === '+server.ts') {
			const source = readFileSync(path.join(ROOT, file), 'utf8');
			for (const m of source.matchAll(METHODS)) keys.push(`${m[1]} ${url}`);
		}
	}
	return keys.sort();
}
