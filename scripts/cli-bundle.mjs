// The command line's prebuilt bundles (build/cli/*.mjs): entries, esbuild options, and whether a
// bundle is older than its sources. Shared by scripts/build-cli.mjs and the launcher scripts/cli.mjs.
import { readdirSync, readFileSync, renameSync, mkdirSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = fileURLToPath(new URL('..', import.meta.url));
export const outdir = path.join(root, 'build/cli');
const inputsFile = path.join(outdir, 'inputs.json');

// Engine-only commands bundle their packages (fewer files to load) as CommonJS, which the
// launcher compiles with a V8 code cache; the server-side ones keep their packages in
// node_modules (sqlite3 is native, sequelize loads its dialect at run time) and stay ES modules.
export const CACHED = ['certify', 'verify', 'blocks-worker'];
const SELF_CONTAINED = [...CACHED, 'coverage', 'plan'];

/** The bundle of a command: .cjs for the cached ones, .mjs for the others. */
export function bundleFile(name) {
	return path.join(outdir, `${name}.${CACHED.includes(name) ? 'cjs' : 'mjs'}`);
}
export const ENTRIES = {
	certify: 'src/cli/certify.ts',
	'blocks-worker': 'src/cli/blocks-worker.ts',
	verify: 'src/cli/verify.ts',
	'keys-rotate': 'src/cli/keys-rotate.ts',
	'ledger-verify': 'src/cli/ledger-verify.ts',
	bench: 'scripts/bench.ts',
	coverage: 'scripts/coverage.ts',
	plan: 'src/cli/plan.ts'
};

/** A Vite glob pattern such as '/templates/mail/*.{txt,html}' (one folder) as a RegExp on names. */
function globRegExp(name) {
	const escaped = name.replace(/[.+^$()|[\]\\]/g, '\\$&').replace(/\*/g, '[^/]*');
	return new RegExp(
		`^${escaped.replace(/\{([^}]*)\}/g, (_, list) => `(${list.split(',').join('|')})`)}$`
	);
}

/**
 * The server's `import.meta.glob('…', { query: '?raw', eager: true })` (a Vite feature) as an
 * object of the files' texts, so that server code (issuing certificates) runs outside Vite.
 */
const globbed = new Set();
const viteGlob = {
	name: 'vite-raw-glob',
	setup(build) {
		build.onLoad({ filter: /src[\\/]lib[\\/]server[\\/].*\.ts$/ }, (args) => {
			const source = readFileSync(args.path, 'utf8');
			if (!source.includes('import.meta.glob(')) return undefined;
			const contents = source.replace(
				/import\.meta\.glob\(\s*'([^']+)'\s*,\s*\{[^}]*\}\s*\)/g,
				(_, pattern) => {
					const folder = path.posix.dirname(pattern);
					const match = globRegExp(path.posix.basename(pattern));
					const files = readdirSync(path.join(root, folder)).filter((f) => match.test(f));
					files.forEach((f) => globbed.add(path.posix.join(folder.slice(1), f)));
					const entries = files.map((f) => [
						`${folder}/${f}`,
						readFileSync(path.join(root, folder, f), 'utf8')
					]);
					return `(${JSON.stringify(Object.fromEntries(entries))})`;
				}
			);
			return { contents, loader: 'ts' };
		});
	}
};

function options(names) {
	return {
		entryPoints: Object.fromEntries(names.map((n) => [n, path.join(root, ENTRIES[n])])),
		outdir,
		outExtension: { '.js': '.mjs' },
		bundle: true,
		platform: 'node',
		format: 'esm',
		target: 'node20',
		mainFields: ['module', 'main'],
		minifyWhitespace: true,
		minifySyntax: true,
		metafile: true,
		write: false,
		logLevel: 'warning',
		plugins: [viteGlob],
		// Bundled CommonJS dependencies call require(); give the ES module one.
		banner: {
			js: "import { createRequire as __rankseal_createRequire } from 'node:module'; const require = __rankseal_createRequire(import.meta.url);"
		}
	};
}

/** CommonJS output; import.meta.url (the worker's location) from the bundle's own file name. */
function commonJs(esm) {
	return {
		...esm,
		format: 'cjs',
		outExtension: { '.js': '.cjs' },
		define: { 'import.meta.url': '__rankseal_import_meta_url' },
		banner: {
			js: "var __rankseal_import_meta_url = require('url').pathToFileURL(__filename).href;"
		}
	};
}

/** Builds every bundle; each file is written beside its place and renamed (concurrent launches). */
export async function buildCli() {
	const { build } = await import('esbuild');
	const selfContained = Object.keys(ENTRIES).filter((n) => SELF_CONTAINED.includes(n));
	const server = Object.keys(ENTRIES).filter((n) => !SELF_CONTAINED.includes(n));
	const cached = Object.keys(ENTRIES).filter((n) => CACHED.includes(n));
	const results = [
		await build(commonJs(options(cached))),
		await build(options(selfContained.filter((n) => !CACHED.includes(n)))),
		await build({ ...options(server), packages: 'external' })
	];
	mkdirSync(outdir, { recursive: true });
	const inputs = new Set(['scripts/cli-bundle.mjs', 'package-lock.json']);
	for (const result of results) {
		for (const file of result.outputFiles) {
			const part = `${file.path}.${process.pid}.part`;
			writeFileSync(part, file.contents);
			renameSync(part, file.path);
		}
		for (const input of Object.keys(result.metafile.inputs))
			if (!input.includes('node_modules/')) inputs.add(path.relative(root, path.resolve(input)));
	}
	for (const file of globbed) inputs.add(file);
	const part = `${inputsFile}.${process.pid}.part`;
	writeFileSync(part, JSON.stringify({ inputs: [...inputs].sort() }));
	renameSync(part, inputsFile);
}

const mtime = (file) => statSync(file, { throwIfNoEntry: false })?.mtimeMs;

/** True when the bundle exists and no source it was built from is newer. */
export function isCurrent(name) {
	const built = mtime(bundleFile(name));
	if (built === undefined) return false;
	let listed;
	try {
		listed = JSON.parse(readFileSync(inputsFile, 'utf8')).inputs;
	} catch {
		return false;
	}
	return listed.every((input) => {
		const changed = mtime(path.join(root, input));
		return changed !== undefined && changed <= built;
	});
}
