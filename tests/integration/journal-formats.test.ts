/**
 * What a journal's production office or a repository reads from a real issued bundle: its
 * RO-Crate metadata against the RO-Crate 1.1 specification's required structure, and the in-toto
 * Statement in its DSSE envelope checked with an independent Ed25519 (node:crypto), then by the
 * bundle's own verify.mjs when a file no longer matches it.
 */
import { spawnSync } from 'node:child_process';
import { createHash, createPublicKey, verify } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { ENGINE_VERSION } from '../../src/lib/certify';
import { BUNDLE_FILES, contentsText, type EvidenceFiles } from '../../src/lib/evidence/layout';
import { signText } from '../../src/lib/evidence/signing';
import { verifyEvidence } from '../../src/lib/evidence/verify';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { certificateFile } from '../../src/lib/server/certificates/certificate-reads';
import { serviceKey } from '../../src/lib/server/evidence/keys';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import { crateProblems } from '../ro-crate-rules';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let scratch: string;
let files: EvidenceFiles;
let doi: string | null;

const EXAMPLE_ORCID = '0000-0002-1825-0097';
const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');
const text = (bytes: Uint8Array) => Buffer.from(bytes).toString('utf8');

/** The bundle's files with some replaced, and contents.json re-signed with the service's own key. */
function resigned(changes: EvidenceFiles): EvidenceFiles {
	const { [BUNDLE_FILES.contents]: list, [BUNDLE_FILES.contentsSignature]: _s, ...rest } = files;
	const { certificateId, fingerprint } = JSON.parse(text(list));
	const changed = { ...rest, ...changes };
	const listed = contentsText(certificateId, fingerprint, changed);
	const signature = signText(listed, serviceKey().secretKey) + '\n';
	const out = { ...changed, [BUNDLE_FILES.contents]: new TextEncoder().encode(listed) };
	return { ...out, [BUNDLE_FILES.contentsSignature]: new TextEncoder().encode(signature) };
}

/** The bundle's own verify.mjs (built from this source) run with Node in an unzipped copy. */
function runVerifyMjs(contents: EvidenceFiles) {
	const dir = mkdtempSync(path.join(scratch, 'bundle-'));
	for (const [name, bytes] of Object.entries(contents)) writeFileSync(path.join(dir, name), bytes);
	const run = spawnSync(process.execPath, ['verify.mjs'], { cwd: dir, encoding: 'utf8' });
	return { status: run.status, out: run.stdout + run.stderr };
}

/** Ed25519 (RFC 8032) verification by node:crypto, from a raw 32-byte public key (as JWK). */
function ed25519Verifies(message: Uint8Array, signature: Uint8Array, publicKeyHex: string) {
	const x = Buffer.from(publicKeyHex, 'hex').toString('base64url');
	const key = createPublicKey({ key: { kty: 'OKP', crv: 'Ed25519', x }, format: 'jwk' });
	return verify(null, message, key, signature);
}

beforeAll(async () => {
	world = await evidenceWorld();
	scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-journal-'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(scratch, 'verify.mjs'));
	const check = await finishedCheck(world, 31);
	// ORCID's own example iD (support article "Structure of the ORCID Identifier").
	await world.database.models.User.update(
		{ orcid: EXAMPLE_ORCID },
		{ where: { id: world.author.userId } }
	);
	const cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
	doi = cert.doi?.doi ?? null;
	files = readZip((await certificateFile(world.database, world.author, cert.id, 'bundle')).bytes);
});
afterAll(async () => {
	await world.ctx.close();
	rmSync(scratch, { recursive: true, force: true });
});

describe('RO-Crate metadata', () => {
	it('meets the RO-Crate 1.1 required structure and lists every file of the zip with its SHA-256', () => {
		const crate = JSON.parse(text(files[BUNDLE_FILES.crate]));
		expect(crateProblems(crate, files, BUNDLE_FILES.crate)).toEqual([]);
		const graph = crate['@graph'] as Record<string, unknown>[];
		const byId = new Map(graph.map((e) => [e['@id'], e]));
		// Only the signed file list and its signature go unhashed: they hash the crate itself.
		const unhashed = graph.filter((e) => e['@type'] === 'File' && !e.sha256).map((e) => e['@id']);
		expect(unhashed.sort()).toEqual([BUNDLE_FILES.contents, BUNDLE_FILES.contentsSignature]);
		const manifest = JSON.parse(text(files[BUNDLE_FILES.manifest]));
		const root = byId.get('./')!;
		expect(root.datePublished).toBe(manifest.issuedAt);
		const action = byId.get((root.mentions as { '@id': string })['@id'])!;
		expect(action['@type']).toBe('CreateAction');
		const engine = byId.get((action.instrument as { '@id': string })['@id'])!;
		expect(engine).toMatchObject({ '@type': 'SoftwareApplication', version: ENGINE_VERSION });
		expect(action.result).toEqual(
			expect.arrayContaining([{ '@id': BUNDLE_FILES.manifest }, { '@id': BUNDLE_FILES.pdf }])
		);
		expect(action.object).toEqual(expect.arrayContaining([{ '@id': 'counts-uploaded.csv' }]));
	});

	it('names an author with an ORCID iD by the iD’s URL and the dataset by its DOI’s URL', () => {
		const crate = JSON.parse(text(files[BUNDLE_FILES.crate]));
		const graph = crate['@graph'] as Record<string, unknown>[];
		const byId = new Map(graph.map((e) => [e['@id'], e]));
		// RO-Crate 1.1 §"People": a Person's @id SHOULD be their ORCID as an https://orcid.org/ URL.
		const orcidId = `https://orcid.org/${EXAMPLE_ORCID}`;
		expect(byId.get(orcidId)).toMatchObject({ '@type': 'Person', name: 'Bo Strand' });
		const root = byId.get('./')!;
		expect(root.author).toEqual(expect.arrayContaining([{ '@id': orcidId }]));
		// Authors without an iD keep a local id; none is named by another's iD.
		const people = graph.filter((e) => e['@type'] === 'Person');
		expect(people.filter((p) => p['@id'] === orcidId)).toHaveLength(1);
		// DOI Handbook / DOI display guidance: a DOI shown as a link is https://doi.org/ + the name.
		expect(doi).toMatch(/^10\.\d{4,}\/\S+$/);
		expect(root.identifier).toBe(`https://doi.org/${doi}`);
	});
});

describe('in-toto Statement in a DSSE envelope', () => {
	it('is signed over PAE with the manifest’s key, and its subjects are the evidence files', () => {
		const envelope = JSON.parse(text(files[BUNDLE_FILES.statement]));
		const manifest = JSON.parse(text(files[BUNDLE_FILES.manifest]));
		const publicKey = text(files[BUNDLE_FILES.publicKey]).trim();
		expect(envelope.payloadType).toBe('application/vnd.in-toto+json');
		expect(envelope.signatures).toHaveLength(1);
		expect(envelope.signatures[0].keyid).toBe(manifest.signingKeyId);
		const body = Buffer.from(envelope.payload, 'base64');
		// PAE as DSSE protocol.md defines it: "DSSEv1" SP LEN(type) SP type SP LEN(body) SP body.
		const type = Buffer.from(envelope.payloadType, 'utf8');
		const message = Buffer.concat([
			Buffer.from(`DSSEv1 ${type.length} `),
			type,
			Buffer.from(` ${body.length} `),
			body
		]);
		const sig = Buffer.from(envelope.signatures[0].sig, 'base64');
		expect(ed25519Verifies(message, sig, publicKey)).toBe(true);
		expect(ed25519Verifies(body, sig, publicKey)).toBe(false);
		const statement = JSON.parse(body.toString('utf8'));
		expect(statement._type).toBe('https://in-toto.io/Statement/v1');
		expect(statement.predicateType).toMatch(/^[a-z][a-z0-9+.-]*:/);
		expect(statement.predicate).toEqual(manifest);
		const notSubjects: string[] = [BUNDLE_FILES.statement, BUNDLE_FILES.crate];
		notSubjects.push(BUNDLE_FILES.contents, BUNDLE_FILES.contentsSignature);
		const evidence = Object.keys(files).filter((n) => !notSubjects.includes(n));
		expect(statement.subject).toEqual(
			evidence.sort().map((name) => ({ name, digest: { sha256: sha256(files[name]) } }))
		);
		expect(verifyEvidence(files).passed).toContain(BUNDLE_FILES.statement);
	});
});

describe('the offline verifier and the Statement', () => {
	it('refuses a file that no longer matches its subject digest, even under a re-signed file list', () => {
		// README.txt is covered by nothing but the file list and the Statement: change it, re-sign the list.
		const readme = new TextEncoder().encode(text(files[BUNDLE_FILES.readme]) + 'planted line\n');
		const tampered = resigned({ [BUNDLE_FILES.readme]: readme });
		expect(verifyEvidence(tampered)).toMatchObject({
			valid: false,
			failedItem: BUNDLE_FILES.readme,
			message: 'its SHA-256 differs from the in-toto Statement'
		});
		expect(runVerifyMjs(tampered)).toMatchObject({
			status: 1,
			out: expect.stringContaining(
				`FAIL at ${BUNDLE_FILES.readme}: its SHA-256 differs from the in-toto Statement`
			)
		});
		expect(runVerifyMjs(files).out).toMatch(/^NOT ANCHORED/m);
	});

	it('refuses an envelope whose signature was changed, naming the envelope', () => {
		const envelope = JSON.parse(text(files[BUNDLE_FILES.statement]));
		const sig = Buffer.from(envelope.signatures[0].sig, 'base64');
		sig[5] ^= 0x01;
		envelope.signatures[0].sig = sig.toString('base64');
		const broken = new TextEncoder().encode(JSON.stringify(envelope));
		const report = verifyEvidence(resigned({ [BUNDLE_FILES.statement]: broken }));
		expect(report).toMatchObject({ valid: false, failedItem: BUNDLE_FILES.statement });
		expect(report.message).toMatch(/no signature by this key over the payload \(PAE\)/);
	});
});
