// npm run demo: build the app and start it on the embedded default (SQLite under data/).
import { spawn, spawnSync } from 'node:child_process';
import { mkdirSync } from 'node:fs';

const port = process.env.PORT ?? '3000';
const host = process.env.HOST ?? '127.0.0.1';
mkdirSync(process.env.RANKSEAL_DATA_DIR ?? 'data', { recursive: true });

console.log('Building Rankseal …');
const build = spawnSync('npm', ['run', '--silent', 'build'], { stdio: 'inherit' });
if (build.status !== 0) process.exit(build.status ?? 1);

const env = {
	...process.env,
	PORT: port,
	HOST: host,
	ORIGIN: process.env.ORIGIN ?? `http://${host === '0.0.0.0' ? 'localhost' : host}:${port}`,
	RANKSEAL_DEMO: '1',
	BODY_SIZE_LIMIT: process.env.BODY_SIZE_LIMIT ?? '25M'
};
console.log(`Rankseal runs at ${env.ORIGIN} (Ctrl-C stops it)`);
const app = spawn('node', ['scripts/server.mjs'], { stdio: 'inherit', env });
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => app.kill(signal));
app.on('exit', (code) => process.exit(code ?? 0));
