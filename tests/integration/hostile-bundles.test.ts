/**
 * Hostile evidence bundles offered to every verifier: the /seal page's service (checkBundle),
 * `npm run verify` on the zip, and the bundle's own verify.mjs on an unzipped folder. Zip bombs,
 * entry names that leave the folder, duplicates, missing and planted files and bytes that are no
 * zip each get a plain "not valid" answer naming what is wrong; none crashes, and none writes a
 * file anywhere.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { deflateRawSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { BUNDLE_FILES, type EvidenceFiles } from '../../src/lib/evidence/layout';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { certificateFile, checkBundle } from '../../src/lib/server/certificates/certificate-reads';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';
import { craftZip, type CraftedEntry } from './zip-craft';

// Safety limits for issuing, bundling and Node child processes on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 900_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let scratch: string;
let files: EvidenceFiles;
let folder: string;
let HOSTILE: [string, Buffer, RegExp][];

beforeAll(async () => {
	world = await evidenceWorld();
	scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-hostile-bundles-'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(scratch, 'verify.mjs'));
	const check = await finishedCheck(world, 23);
	const cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
	const zip = (await certificateFile(world.database, world.author, cert.id, 'bundle')).bytes;
	files = readZip(zip);
	folder = `rankseal-${cert.id}`;
	HOSTILE = hostileBundles();
});
afterAll(async () => {
	await world.ctx.close();
	rmSync(scratch, { recursive: true, force: true });
});

/** The genuine bundle's entries under its folder, changed by `edit`. */
function entries(edit: (list: CraftedEntry[]) => CraftedEntry[] = (l) => l): CraftedEntry[] {
	const list = Object.entries(files).map(([name, bytes]) => ({
		name: `${folder}/${name}`,
		bytes,
		deflate: true
	}));
	return edit(list);
}
const renamed = (from: string, to: string) => (list: CraftedEntry[]) =>
	list.map((e) => (e.name === `${folder}/${from}` ? { ...e, name: to } : e));

// 80 MiB of zeros deflates to about 80 kB: more than any one bundle file may inflate to.
const BOMB_SIZE = 80 * 1024 * 1024;
const bomb = deflateRawSync(Buffer.alloc(BOMB_SIZE));
const bombEntry = (name: string, declaredSize = BOMB_SIZE): CraftedEntry => ({
	name,
	bytes: new Uint8Array(0),
	declaredSize,
	raw: bomb
});
const sixty = deflateRawSync(Buffer.alloc(60 * 1024 * 1024));

/** Made once the genuine bundle exists: what each is, its bytes, and the refusal's words. */
const hostileBundles = (): [string, Buffer, RegExp][] => [
	['a bomb entry', craftZip(entries((l) => [...l, bombEntry(`${folder}/x.bin`)])), /inflates/],
	[
		'a bomb that declares 1 kB',
		craftZip(entries((l) => [bombEntry(`${folder}/result.json`, 1000), ...l.slice(1)])),
		/cannot be inflated|not the size/
	],
	[
		'three 60 MiB entries',
		craftZip(
			['a', 'b', 'c'].map((n) => ({
				...{ name: `${folder}/${n}.bin`, bytes: new Uint8Array(0), raw: sixty },
				declaredSize: 60 * 1024 * 1024
			}))
		),
		/inflates to more/
	],
	[
		'a thousand entries',
		craftZip(
			Array.from({ length: 1000 }, (_, i) => ({
				name: `${folder}/f${i}`,
				bytes: new Uint8Array(1)
			}))
		),
		/far more than a bundle/
	],
	...['../manifest.json', '/manifest.json', `${folder}/../manifest.json`, '..\\manifest.json']
		.concat(['C:/manifest.json', `${folder}/sub/manifest.json`, `${folder}\\manifest.json`])
		.map((name): [string, Buffer, RegExp] => [
			`the manifest as ${name}`,
			craftZip(entries(renamed(BUNDLE_FILES.manifest, name))),
			/is not a bundle file/
		]),
	[
		'the manifest twice',
		craftZip(entries((l) => [...l, l.find((e) => e.name.endsWith(BUNDLE_FILES.manifest))!])),
		/holds manifest\.json twice/
	],
	...[
		BUNDLE_FILES.manifest,
		BUNDLE_FILES.contents,
		BUNDLE_FILES.verifier,
		'counts-uploaded.csv'
	].map((name): [string, Buffer, RegExp] => [
		`no ${name}`,
		craftZip(entries((l) => l.filter((e) => !e.name.endsWith(`/${name}`)))),
		/missing|not valid|not one line|cannot be checked/
	]),
	[
		'a planted run.sh',
		craftZip(entries((l) => [...l, { name: `${folder}/run.sh`, bytes: Buffer.from('rm -rf ~') }])),
		/not in the signed file list/
	],
	['no zip at all', Buffer.from('%PDF-1.7 not a zip'), /not a zip archive/],
	['an empty file', Buffer.alloc(0), /not a zip archive/],
	['a zip cut short', craftZip(entries()).subarray(0, 5000), /not a zip archive|not a readable/]
];

/** `npm run --silent verify -- A.zip B.zip …` (the script it runs, through tsx), from `cwd`. */
function runCli(zipFiles: string[], cwd: string) {
	const tsx = path.resolve('node_modules/.bin/tsx');
	const script = path.resolve('src/cli/verify.ts');
	const run = spawnSync(tsx, [script, ...zipFiles], { cwd, encoding: 'utf8' });
	return { status: run.status, out: run.stdout + run.stderr };
}

describe('hostile bundles', () => {
	it('are refused by the /seal service, naming what is wrong', async () => {
		for (const [what, zip, reason] of HOSTILE) {
			const { report } = await checkBundle(world.database, zip);
			expect(report.valid, what).toBe(false);
			expect(`${report.failedItem}: ${report.message}`, what).toMatch(reason);
		}
	});

	it('are refused by npm run verify (exit 1, FAIL and the reason), writing nothing', () => {
		const inbox = mkdtempSync(path.join(scratch, 'inbox-'));
		const cwd = mkdtempSync(path.join(inbox, 'cwd-'));
		const given = HOSTILE.map(([what, zip], i) => {
			const file = path.join(inbox, `hostile-${i}.zip`);
			writeFileSync(file, zip);
			return { what, file };
		});
		const run = runCli(
			given.map((g) => g.file),
			cwd
		);
		expect(run.status, run.out).toBe(1);
		// One report per bundle, each headed "== FILE".
		const reports = run.out.split(/^== /m).slice(1);
		expect(reports).toHaveLength(given.length);
		for (const [i, { what, file }] of given.entries()) {
			expect(reports[i].startsWith(file), what).toBe(true);
			expect(reports[i], what).toMatch(/^FAIL/m);
			expect(reports[i], what).toMatch(HOSTILE[i][2]);
		}
		expect(readdirSync(cwd)).toEqual([]);
		expect(readdirSync(inbox).sort()).toEqual(
			[path.basename(cwd), ...given.map((g) => path.basename(g.file))].sort()
		);
	});

	it('in a folder: verify.mjs refuses missing and planted files and ignores only hidden ones', () => {
		const run = (edit: (dir: string) => void) => {
			const dir = mkdtempSync(path.join(scratch, 'folder-'));
			for (const [name, bytes] of Object.entries(files)) writeFileSync(path.join(dir, name), bytes);
			edit(dir);
			const done = spawnSync(process.execPath, ['verify.mjs'], { cwd: dir, encoding: 'utf8' });
			return { status: done.status, out: done.stdout + done.stderr };
		};
		// 3: valid, the key vouched for by the bundle alone (no --keys here; key-anchors.test.ts).
		expect(run(() => undefined).status).toBe(3);
		expect(run((dir) => writeFileSync(path.join(dir, '.DS_Store'), 'x')).status).toBe(3);
		const planted = run((dir) => writeFileSync(path.join(dir, 'run.sh'), 'rm -rf ~'));
		expect(planted.status).toBe(1);
		expect(planted.out).toMatch(/FAIL at run\.sh: the file is not in the signed file list/);
		writeFileSync(path.join(scratch, 'outside.txt'), 'not part of any bundle');
		const linked = run((dir) =>
			symlinkSync(path.join(scratch, 'outside.txt'), path.join(dir, 'o'))
		);
		expect(linked.out).toMatch(/FAIL at o: the file is not in the signed file list/);
		const missing = run((dir) => rmSync(path.join(dir, BUNDLE_FILES.result)));
		expect(missing.status).toBe(1);
		expect(missing.out).toMatch(/FAIL at result\.json: the file is missing/);
	});
});
