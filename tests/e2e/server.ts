/**
 * Runs the built app (`node scripts/server.mjs`: adapter-node's build/index.js) on a free local
 * port for page tests.
 * The test script builds first; here a missing build is an error that says so.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { createServer } from 'node:net';
import path, { resolve } from 'node:path';

const BUILD = resolve('build/index.js');
/** adapter-node's server with the security headers on its own files (npm start). */
const ENTRY = resolve('scripts/server.mjs');

export interface AppServer {
	origin: string;
	port: number;
	child: ChildProcess;
	/** Everything the server printed, for failure messages. */
	output(): string;
	stop(): Promise<void>;
	/** SIGKILL: no clean-up at all, as a power cut would leave the data folder. */
	kill(): Promise<void>;
}

function freePort(): Promise<number> {
	return new Promise((done, fail) => {
		const probe = createServer();
		probe.once('error', fail);
		probe.listen(0, '127.0.0.1', () => {
			const address = probe.address();
			const port = typeof address === 'object' && address ? address.port : 0;
			probe.close(() => done(port));
		});
	});
}

/**
 * Resolves when adapter-node says it listens, which it does only after the hooks' init (database,
 * mail, check runner) has finished; rejects if the app exits first. No polling, no deadline: the
 * test runner's hook timeout is the only bound.
 */
function untilListening(child: ChildProcess, log: () => string): Promise<void> {
	return new Promise((done, fail) => {
		const heard = () => {
			if (!/Listening on /.test(log())) return;
			child.off('exit', exited);
			child.stdout?.off('data', heard);
			done();
		};
		const exited = (code: number | null) => {
			child.stdout?.off('data', heard);
			fail(new Error(`the app exited with code ${code} before listening:\n${log()}`));
		};
		child.stdout?.on('data', heard);
		child.once('exit', exited);
	});
}

/**
 * Page tests share one client address (127.0.0.1) and make many requests: the limits are raised
 * far above what they do, so only a test that names its own RANKSEAL_RATE_LIMITS meets them.
 * The same for checks queued and uploads in progress at once: how many are still at work when the
 * next one is asked for depends on the machine's speed, so only a test that names its own limits
 * meets them.
 */
export const ROOMY_RATE_LIMITS = JSON.stringify({
	signInAccountAddress: { free: 1000, cap: 2000 },
	signInAccount: { free: 1000, cap: 2000 },
	signInAddress: { free: 10000, cap: 20000 },
	signUp: { points: 10000 },
	resetRequest: { points: 10000 },
	resendVerification: { points: 10000 },
	invitations: { points: 10000 },
	reviewUse: { points: 100000 },
	reviewRefused: { free: 10000, cap: 20000 },
	sealBundle: { points: 10000 },
	sealLookup: { points: 100000 },
	mailPerRecipient: { points: 10000 },
	planSimulations: { points: 10000 },
	orcidSignIn: { points: 10000 }
});

export async function startApp(env: Record<string, string> = {}): Promise<AppServer> {
	if (!existsSync(BUILD)) {
		throw new Error(`${BUILD} is missing: build the app first (npx vite build, or npm test)`);
	}
	const port = await freePort();
	const origin = `http://127.0.0.1:${port}`;
	const child = spawn(process.execPath, [ENTRY], {
		env: {
			...process.env,
			// A fresh data folder and any free port for the mail catcher, unless the test names them.
			BODY_SIZE_LIMIT: '25M',
			RANKSEAL_DATA_DIR: mkdtempSync(path.join(tmpdir(), 'rankseal-app-')),
			MAIL_CATCHER_PORT: '0',
			RANKSEAL_RATE_LIMITS: ROOMY_RATE_LIMITS,
			RANKSEAL_CHECKS_PER_USER: '1000',
			RANKSEAL_CHECKS_PER_GROUP: '1000',
			RANKSEAL_UPLOADS_PER_USER: '1000',
			RANKSEAL_UPLOADS_PER_GROUP: '1000',
			...env,
			PORT: String(port),
			HOST: '127.0.0.1',
			// A test may name another ORIGIN (https, to see Secure cookies); requests still go to `origin`.
			ORIGIN: env.ORIGIN ?? origin
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	let log = '';
	child.stdout?.on('data', (chunk) => (log += chunk));
	child.stderr?.on('data', (chunk) => (log += chunk));
	const output = () => log;
	const stop = () =>
		new Promise<void>((done) => {
			if (child.exitCode !== null || child.signalCode !== null) return done();
			// adapter-node drains open connections on SIGTERM; do not wait on them for long.
			const force = setTimeout(() => child.kill('SIGKILL'), 5000);
			child.once('exit', () => {
				clearTimeout(force);
				done();
			});
			child.kill('SIGTERM');
		});
	const kill = () =>
		new Promise<void>((done) => {
			if (child.exitCode !== null || child.signalCode !== null) return done();
			child.once('exit', () => done());
			child.kill('SIGKILL');
		});
	try {
		await untilListening(child, output);
	} catch (error) {
		await stop();
		throw error;
	}
	return { origin, port, child, output, stop, kill };
}
