// npm run bench:load — a benchmark, never a test. Starts the production build as npm start does
// (scripts/server.mjs) on loopback over a fresh data folder seeded with the demo scenario, starts
// four long checks, then loads a claim page (signed in), an API GET (token), a review-link page and
// a static file one after another with autocannon, and prints requests/s, p50/p95/p99 latency, the
// ratio to the static file and the error/non-2xx count of each. Options: --connections N (per
// target, default 50), --duration S (default 30), --resamples R (each long check, default 1000000),
// --timeout S (one request, default 30; a request slower than that counts as an error).
// Issue 16 adds two targets (scripts/bench-load-heavy.mjs): `seal` (6 heavy bundle checks in
// flight; bystander p95 against idle, --bundle-resamples R, default 10^6, --seal-duration S,
// default 15) and `uploads` (peak resident growth per hostile 20 MiB upload and for 4 at once).
// --only picks targets (default: pages, as before); `--only seal,uploads` runs issue 16's two on
// the service's default pool (RANKSEAL_CHECK_WORKERS 2; pages need 4 for their long checks).
import autocannon from 'autocannon';
import { sealTarget, uploadTarget } from './bench-load-heavy.mjs';
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';

const arg = (name, fallback) => {
	const at = process.argv.indexOf(`--${name}`);
	const value = at > 0 ? process.argv[at + 1] : process.env[`BENCH_${name.toUpperCase()}`];
	return value === undefined ? fallback : Number(value);
};
const connections = arg('connections', 50);
const duration = arg('duration', 30);
const resamples = arg('resamples', 1_000_000);
const timeout = arg('timeout', 30);
const bundleResamples = arg('bundle-resamples', 1_000_000);
const sealDuration = arg('seal-duration', 15);
const onlyAt = process.argv.indexOf('--only');
const only = new Set((onlyAt > 0 ? process.argv[onlyAt + 1] : 'pages').split(','));
const BUILD = path.resolve('build/index.js');
const ENTRY = path.resolve('scripts/server.mjs');
// The bench must not meet a limit: every one is raised far above what it sends.
const ROOMY = { free: 1e9, cap: 2e9 };
const LIMITS = {
	signInAccount: ROOMY,
	signInAddress: ROOMY,
	reviewUse: { points: 1e9 },
	reviewRefused: ROOMY,
	sealBundle: { points: 1e9 },
	sealLookup: { points: 1e9 }
};

if (!existsSync(BUILD)) {
	console.error(`${BUILD} is missing: run npm run build first.`);
	process.exit(2);
}

function freePort() {
	return new Promise((done, fail) => {
		const probe = createServer();
		probe.once('error', fail);
		probe.listen(0, '127.0.0.1', () => {
			const { port } = probe.address();
			probe.close(() => done(port));
		});
	});
}

/** Starts the app; resolves once adapter-node says it listens (after the demo is seeded). */
async function startApp(dataDir) {
	const port = await freePort();
	const origin = `http://127.0.0.1:${port}`;
	const env = {
		...process.env,
		...{ PORT: String(port), HOST: '127.0.0.1', ORIGIN: origin, RANKSEAL_DATA_DIR: dataDir },
		...{ RANKSEAL_DEMO: '1', MAIL_CATCHER_PORT: '0', RANKSEAL_RATE_LIMITS: JSON.stringify(LIMITS) },
		// The four long checks must all start, even while the demo's own checks still run, and run
		// at once: four worker threads (the default is two) on however many cores there are.
		...{ RANKSEAL_CHECKS_PER_USER: '16', RANKSEAL_CHECKS_PER_GROUP: '16' },
		...{ RANKSEAL_UPLOADS_PER_USER: '8', RANKSEAL_UPLOADS_PER_GROUP: '8', BODY_SIZE_LIMIT: '25M' },
		// The heavy targets run on the service's default pool (two check threads and one more).
		RANKSEAL_CHECK_WORKERS: process.env.RANKSEAL_CHECK_WORKERS ?? (only.has('pages') ? '4' : '2')
	};
	const child = spawn(process.execPath, [ENTRY], { env, stdio: ['ignore', 'pipe', 'pipe'] });
	let log = '';
	await new Promise((done, fail) => {
		const heard = (chunk) => {
			log += chunk;
			if (/Listening on /.test(log)) done();
		};
		child.stdout.on('data', heard);
		child.stderr.on('data', (chunk) => (log += chunk));
		child.once('exit', (code) => fail(new Error(`the app exited (${code}):\n${log}`)));
	});
	return { origin, child, log: () => log };
}

async function signIn(origin, email, password) {
	const response = await fetch(`${origin}/login?/login`, {
		method: 'POST',
		redirect: 'manual',
		headers: { origin, 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
		body: new URLSearchParams({ email, password })
	});
	const cookie = response.headers.get('set-cookie')?.match(/rankseal_session=[^;]+/)?.[0];
	if (!cookie) throw new Error(`signing in as ${email} answered ${response.status}`);
	return cookie;
}

let started = 0;
/** `count` long checks on the demo claims (round robin); returns their ids. */
async function startLongChecks(api, bearer, claims, count = 4) {
	const ids = [];
	for (let i = 0; i < count; i++) {
		const claim = claims[i % claims.length];
		const response = await fetch(`${api}/claims/${claim.id}/checks`, {
			method: 'POST',
			headers: { ...bearer, 'content-type': 'application/json' },
			body: JSON.stringify({ seed: 1000 + started++, resamples })
		});
		const body = await response.json();
		if (response.status !== 202) console.log(`check ${i + 1} refused: ${JSON.stringify(body)}`);
		else ids.push(body.id);
	}
	return ids;
}

/** The ids among `ids` still queued or running. */
async function liveChecks(api, bearer, ids) {
	const live = [];
	for (const id of ids) {
		const { status } = await (await fetch(`${api}/checks/${id}`, { headers: bearer })).json();
		if (status === 'queued' || status === 'running') live.push(id);
	}
	return live;
}

async function checkStates(api, bearer, ids) {
	const states = [];
	for (const id of ids)
		states.push((await (await fetch(`${api}/checks/${id}`, { headers: bearer })).json()).status);
	return states.join(', ') || 'none';
}

/** One autocannon run, keeping every response time so p95 is exact (nearest rank). */
function load(name, url, headers) {
	return new Promise((done, fail) => {
		const times = [];
		const instance = autocannon(
			{ url, headers, connections, duration, timeout },
			(error, result) => (error ? fail(error) : done({ name, result, times }))
		);
		instance.on('response', (_client, _status, _bytes, responseTime) => times.push(responseTime));
	});
}

const rank = (sorted, q) =>
	sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)] ?? NaN;

function table(runs) {
	const staticRun = runs.find((r) => r.name === 'static file');
	const rows = runs.map(({ name, result, times }) => {
		const sorted = [...times].sort((a, b) => a - b);
		const [p50, p95, p99] = [0.5, 0.95, 0.99].map((q) => rank(sorted, q));
		const { errors, timeouts, non2xx } = result;
		const bad = errors + non2xx;
		const rps = times.length / duration;
		return { name, rps, p50, p95, p99, bad, timeouts, non2xx, total: times.length };
	});
	const base = rows.find((r) => r.name === staticRun.name);
	console.log(
		'\ntarget           req/s  p50 ms  p95 ms  p99 ms  p95 ÷ static  errors (timeouts), non-2xx / answered'
	);
	for (const r of rows) {
		const ratio = (r.p95 / Math.max(base.p95, 1)).toFixed(1);
		const cells = [
			r.name.padEnd(14),
			r.rps.toFixed(0).padStart(7),
			...[r.p50, r.p95, r.p99].map((v) => v.toFixed(0).padStart(7))
		];
		const faults = `${r.bad - r.non2xx} (${r.timeouts}), ${r.non2xx} / ${r.total}`;
		console.log(`${cells.join(' ')}  ${ratio.padStart(12)}  ${faults}`);
	}
	return rows.reduce((sum, r) => sum + r.bad, 0);
}

/** Thrown to skip the page targets (--only without `pages`). */
class Done extends Error {}

const dataDir = mkdtempSync(path.join(tmpdir(), 'rankseal-bench-load-'));
const app = await startApp(dataDir);
try {
	const api = `${app.origin}/api/v1`;
	const token = readFileSync(path.join(dataDir, 'demo', 'api-token.txt'), 'utf8').trim();
	const reviewLink = readFileSync(path.join(dataDir, 'demo', 'review-link.txt'), 'utf8').trim();
	const bearer = { authorization: `Bearer ${token}` };
	const claims = (await (await fetch(`${api}/claims`, { headers: bearer })).json()).items;
	let fine = true;
	if (only.has('uploads')) fine = (await uploadTarget(api, bearer, app.child.pid)) && fine;
	if (only.has('seal'))
		fine = (await sealTarget(app.origin, api, bearer, { bundleResamples, sealDuration })) && fine;
	if (!fine) process.exitCode = 1;
	if (!only.has('pages')) throw new Done();
	const cookie = await signIn(app.origin, 'eliot@halvorsen-lake.example', 'demo-author-2026');
	const checks = await startLongChecks(api, bearer, claims);
	console.log(
		`${connections} connections per target for ${duration} s; long checks (${resamples} resamples): ${await checkStates(api, bearer, checks)}`
	);
	// One target at a time, each while the long checks run: a static file loaded at once with the
	// pages would take the event loop from them and measure itself, not them.
	const targets = [
		['claim page', `${app.origin}/claims/${claims[0].id}`, { cookie }],
		['API GET', `${api}/claims/${claims[0].id}`, bearer],
		['review page', reviewLink, {}],
		['static file', `${app.origin}/favicon.svg`, {}]
	];
	// A check that finishes is replaced at once, so four are at work through every target.
	let keeping = true;
	const keeper = (async () => {
		while (keeping) {
			const live = await liveChecks(api, bearer, checks);
			const more = await startLongChecks(api, bearer, claims, 4 - live.length);
			checks.splice(0, checks.length, ...live, ...more);
			await new Promise((wake) => setTimeout(wake, 250));
		}
	})();
	const runs = [];
	for (const [name, url, headers] of targets) {
		runs.push(await load(name, url, headers));
		console.log(`after ${name}: long checks ${await checkStates(api, bearer, checks)}`);
	}
	keeping = false;
	await keeper;
	console.log(`long checks started in all: ${started}`);
	const bad = table(runs);
	if (bad > 0) process.exitCode = 1;
} catch (error) {
	if (error instanceof Done) process.exitCode ??= 0;
	else {
		console.error(`the server said:\n${app.log().slice(-4000)}`);
		throw error;
	}
} finally {
	app.child.kill('SIGTERM');
	await new Promise((done) => app.child.once('exit', done));
	rmSync(dataDir, { recursive: true, force: true });
}
