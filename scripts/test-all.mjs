// npm test: every check on a fresh machine — system packages for the browser and PDF tests,
// type check, production build, then unit, integration and browser tests.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

const SYSTEM_PACKAGES = [
	{ binary: '/usr/bin/chromium', pkg: 'chromium' },
	{ binary: '/usr/bin/pdftotext', pkg: 'poppler-utils' }
];

function step(title, command, args, options = {}) {
	console.log(`\n── ${title}: ${command} ${args.join(' ')}`);
	const result = spawnSync(command, args, { stdio: 'inherit', ...options });
	if (result.status !== 0) {
		console.error(`\n${title} failed (exit ${result.status ?? result.signal}).`);
		process.exit(result.status || 1);
	}
}

const missing = SYSTEM_PACKAGES.filter((p) => !existsSync(p.binary)).map((p) => p.pkg);
if (missing.length) {
	const root = process.getuid?.() === 0;
	const sudo = root ? [] : ['sudo'];
	if (!root && spawnSync('sudo', ['-n', 'true']).status !== 0) {
		console.error(
			`Missing Debian packages: ${missing.join(' ')}. Install them with: sudo apt-get install -y ${missing.join(' ')}`
		);
		process.exit(1);
	}
	const run = (args) =>
		step('system packages', sudo[0] ?? args[0], sudo.length ? args : args.slice(1), {
			env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
		});
	run(['apt-get', 'update', '-q']);
	run(['apt-get', 'install', '-y', '-q', ...missing]);
}
if (!existsSync('node_modules/.package-lock.json')) step('install', 'npm', ['ci']);

console.log(
	`node ${process.version}, chromium: ${execFileSync('/usr/bin/chromium', ['--version']).toString().trim()}`
);
step('sync', 'npx', ['svelte-kit', 'sync']);
step('type check', 'npx', ['svelte-check', '--tsconfig', './tsconfig.json', '--fail-on-warnings']);
step('build', 'npm', ['run', '--silent', 'build']);
step('tests', 'npx', ['vitest', 'run']);
