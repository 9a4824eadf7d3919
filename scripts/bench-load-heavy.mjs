// The heavy targets of npm run bench:load (issue 16), used by scripts/bench-load.mjs:
// `seal` keeps 6 checks of a heavy evidence bundle (d = 31, --bundle-resamples, default 10^6) in
// flight on /seal and compares a bystander's GET /api/v1/signing-keys p95 with its idle value
// (target: within 2x); `uploads` posts hostile 20 MiB counts files one at a time, then four at
// once, and reports the server's peak resident growth from /proc/PID/status VmHWM, reset through
// /proc/PID/clear_refs before each (targets: at most 10x the file each, 600 MB for four at once).
import autocannon from 'autocannon';
import { readFileSync, writeFileSync } from 'node:fs';

const MIB = 2 ** 20;

/** A d x d table with strong diagonal correlations, seeded (mulberry32, common practice). */
function countsCsv(d, bases, seed) {
	let state = seed >>> 0;
	const next = () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = Math.imul(state ^ (state >>> 15), state | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
	const lines = ['basis,outcome_a,outcome_b,counts'];
	for (const basis of bases)
		for (let a = 0; a < d; a++)
			for (let b = 0; b < d; b++)
				lines.push(
					`${basis},${a},${b},${Math.floor((a === b ? 4000 : 20) * (0.9 + 0.2 * next()))}`
				);
	return lines.join('\n') + '\n';
}

async function call(api, bearer, method, path, body, type = 'application/json') {
	const response = await fetch(`${api}${path}`, {
		method,
		headers: { ...bearer, ...(body === undefined ? {} : { 'content-type': type }) },
		body: body === undefined ? undefined : typeof body === 'string' ? body : JSON.stringify(body)
	});
	const text = await response.text();
	return {
		status: response.status,
		body: text.startsWith('{') || text.startsWith('[') ? JSON.parse(text) : text
	};
}

async function newClaim(api, bearer, fields) {
	const claim = await call(api, bearer, 'POST', '/claims', {
		title: fields.title,
		sourceDescription: 'Bench load (simulated)',
		...fields
	});
	if (claim.status !== 201) throw new Error(`claim: ${JSON.stringify(claim.body)}`);
	return claim.body.id;
}

/** Issues a certificate from a d = 31, `resamples` check and returns its bundle's bytes. */
async function heavyBundle(api, bearer, resamples) {
	const fields = { title: 'Bench: heavy bundle', dimension: 31, method: 'steering-2mub' };
	const id = await newClaim(api, bearer, { ...fields, claimedSchmidtNumber: 10 });
	const upload = await call(
		api,
		bearer,
		'POST',
		`/claims/${id}/datasets`,
		countsCsv(31, [0, 1], 31),
		'text/csv'
	);
	if (upload.status !== 201) throw new Error(`upload: ${JSON.stringify(upload.body)}`);
	const check = await call(api, bearer, 'POST', `/claims/${id}/checks`, { seed: 31, resamples });
	if (check.status !== 202) throw new Error(`check: ${JSON.stringify(check.body)}`);
	let state;
	do {
		await new Promise((wake) => setTimeout(wake, 1000));
		state = (await call(api, bearer, 'GET', `/checks/${check.body.id}`)).body;
	} while (state.status === 'queued' || state.status === 'running');
	if (state.status !== 'done') throw new Error(`check ended ${state.status}: ${state.error}`);
	const issued = await call(api, bearer, 'POST', `/claims/${id}/certificates`, {
		checkId: check.body.id
	});
	if (issued.status !== 201) throw new Error(`issue: ${JSON.stringify(issued.body)}`);
	const bundle = await fetch(`${api}/certificates/${issued.body.id}/bundle`, { headers: bearer });
	return new Uint8Array(await bundle.arrayBuffer());
}

function p95Of(url, headers, { connections, duration }) {
	return new Promise((done, fail) => {
		const times = [];
		const run = autocannon(
			{ url, headers, connections, duration, timeout: 60 },
			(error, result) => {
				if (error) return fail(error);
				const sorted = times.sort((a, b) => a - b);
				const p95 = sorted[Math.min(sorted.length - 1, Math.ceil(0.95 * sorted.length) - 1)];
				done({ p95, answered: sorted.length, bad: result.errors + result.non2xx });
			}
		);
		run.on('response', (_c, _s, _b, responseTime) => times.push(responseTime));
	});
}

/** Six bundle checks kept in flight on /seal while the bystander is loaded; p95 against idle. */
export async function sealTarget(origin, api, bearer, options) {
	console.log(
		`\n/seal: issuing a d = 31 certificate from a ${options.bundleResamples}-resample check…`
	);
	const bundle = await heavyBundle(api, bearer, options.bundleResamples);
	const bystander = `${api}/signing-keys`;
	const load = { connections: 4, duration: options.sealDuration };
	const idle = await p95Of(bystander, {}, load);
	let keeping = true;
	let checked = 0;
	let refused = 0;
	const seal = async () => {
		while (keeping) {
			const form = new FormData();
			form.set('bundle', new Blob([bundle]), 'bundle.zip');
			const response = await fetch(`${origin}/seal?/bundle`, {
				method: 'POST',
				headers: { origin, 'x-sveltekit-action': 'true' },
				body: form
			});
			const text = await response.text();
			if (!/"valid\\?":true|valid":true|Intact/.test(text) && !text.includes('true'))
				console.log(`seal answered ${response.status}`);
			checked++;
		}
	};
	const sealers = Array.from({ length: 6 }, seal);
	const busy = await p95Of(bystander, {}, load);
	keeping = false;
	await Promise.all(sealers);
	const ratio = busy.p95 / Math.max(idle.p95, 1);
	console.log(
		`bystander GET /api/v1/signing-keys, ${load.connections} connections, ${load.duration} s each`
	);
	console.log(`  idle: p95 ${idle.p95} ms (${idle.answered} answered, ${idle.bad} bad)`);
	console.log(
		`  6 bundle checks in flight: p95 ${busy.p95} ms (${busy.answered} answered, ${busy.bad} bad); ${checked} bundles checked meanwhile, ${refused} refused`
	);
	console.log(`  ratio ${ratio.toFixed(2)} (target: within 2)`);
	return ratio <= 2 && idle.bad + busy.bad === 0;
}

/** Resident set now and its peak since the last reset, in bytes (Linux /proc). */
function memory(pid) {
	const status = readFileSync(`/proc/${pid}/status`, 'utf8');
	const kb = (name) => Number(new RegExp(`${name}:\\s+(\\d+)`).exec(status)[1]) * 1024;
	return { rss: kb('VmRSS'), peak: kb('VmHWM') };
}

/** Peak resident growth while `work` runs: the peak is reset to the current resident set first. */
async function growth(pid, work) {
	writeFileSync(`/proc/${pid}/clear_refs`, '5');
	const before = memory(pid).rss;
	const result = await work();
	return { result, growth: memory(pid).peak - before };
}

/** A JSON counts file of d = 256 tables just under `bytes`; `variant` changes one count. */
function bigJson(bytes, variant) {
	const d = 256;
	const row = `[${Array.from({ length: d }, (_, b) => (b === 0 ? 1000 + variant : 120 + (b % 7))).join(',')}]`;
	const table = (basis) => `{"basis":${basis},"counts":[${Array(d).fill(row).join(',')}]}`;
	const tables = [];
	let size = 40;
	for (let basis = 0; basis <= d && size + table(basis).length + 1 < bytes; basis++) {
		tables.push(table(basis));
		size += tables[tables.length - 1].length + 1;
	}
	return `{"dimension":${d},"tables":[${tables.join(',')}]}`;
}

function hostileFiles() {
	const limit = 20 * MIB;
	const wide = `{"dimension":3000,"tables":[{"basis":0,"counts":[[${Array(
		Math.floor((limit - 100) / 2)
	)
		.fill('0')
		.join(',')}]]}]}`;
	const zeros = `basis,outcome_a,outcome_b,counts\n${Array(Math.floor((limit - 40) / 2))
		.fill('0')
		.join(',')}\n`;
	return [
		['20 MiB JSON, d = 256', bigJson(limit, 0), 'application/json'],
		['20 MiB JSON, d = 3000', wide, 'application/json'],
		['one row of 10 million zeros', zeros, 'text/csv']
	];
}

/** Hostile 20 MiB uploads one by one, then four at once; peak resident growth of the server. */
export async function uploadTarget(api, bearer, pid) {
	const fields = {
		title: 'Bench: uploads',
		dimension: 256,
		method: 'mub-correlation',
		bases: [0, 1]
	};
	// Made first: an idle keep-alive connection is closed by the server after 5 s, and reusing
	// it as that happens cuts the upload (EPIPE), not the server's doing.
	const files = hostileFiles();
	const four = Array.from({ length: 4 }, (_, i) => bigJson(20 * MIB, i + 1));
	const id = await newClaim(api, bearer, { ...fields, claimedSchmidtNumber: 2 });
	// Warm the pool's threads first: their start is not the upload's cost.
	await call(api, bearer, 'POST', `/claims/${id}/datasets`, bigJson(MIB, 99), 'application/json');
	console.log('\nuploads: peak resident growth of the server (VmHWM after a reset to VmRSS)');
	let fine = true;
	for (const [name, text, type] of files) {
		const size = Buffer.byteLength(text);
		const { result, growth: grew } = await growth(pid, () =>
			call(api, bearer, 'POST', `/claims/${id}/datasets`, text, type)
		);
		const said = result.body.error ? `${result.body.error.message.slice(0, 70)}` : 'stored';
		console.log(
			`  ${name} (${(size / MIB).toFixed(1)} MiB): ${result.status} ${said}; +${(grew / MIB).toFixed(0)} MiB = ${(grew / size).toFixed(1)}x the file (target <= 10x)`
		);
		fine &&= grew <= 10 * size;
	}
	const { result, growth: grew } = await growth(pid, () =>
		Promise.all(
			four.map((text) =>
				call(api, bearer, 'POST', `/claims/${id}/datasets`, text, 'application/json')
			)
		)
	);
	console.log(
		`  four 20 MiB JSON at once (${result.map((r) => r.status).join(', ')}): +${(grew / MIB).toFixed(0)} MiB (target <= 600 MB)`
	);
	return fine && grew <= 600e6;
}
