/**
 * The certificate PDF as PDF/A-3b (ISO 19005-3) with the signed manifest inside, read back from
 * a real issued certificate with poppler (pdfdetach, pdfinfo, pdffonts) and checked with an
 * independent Ed25519 (node:crypto).
 */
import { execFileSync } from 'node:child_process';
import { createHash, createPublicKey, verify } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { BUNDLE_FILES, type EvidenceFiles } from '../../src/lib/evidence/layout';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { certificateFile } from '../../src/lib/server/certificates/certificate-reads';
import { readZip } from '../../src/lib/server/evidence/zip-read';
import { pdfObjects, popplerFonts } from '../pdf-glyphs';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let scratch: string;
let files: EvidenceFiles;
let pdf: Buffer;
let pdfFile: string;

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');
const poppler = (tool: string, args: string[]) =>
	execFileSync(tool, args, { encoding: 'utf8', cwd: scratch });

/** Ed25519 (RFC 8032) verification by node:crypto, from a raw 32-byte public key (as JWK). */
function ed25519Verifies(message: Uint8Array, signature: Uint8Array, publicKeyHex: string) {
	const x = Buffer.from(publicKeyHex, 'hex').toString('base64url');
	const key = createPublicKey({ key: { kty: 'OKP', crv: 'Ed25519', x }, format: 'jwk' });
	return verify(null, message, key, signature);
}

beforeAll(async () => {
	world = await evidenceWorld();
	scratch = mkdtempSync(path.join(tmpdir(), 'rankseal-pdfa-'));
	const check = await finishedCheck(world, 33);
	const cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
	files = readZip((await certificateFile(world.database, world.author, cert.id, 'bundle')).bytes);
	pdf = (await certificateFile(world.database, world.author, cert.id, 'pdf')).bytes;
	pdfFile = path.join(scratch, 'certificate.pdf');
	writeFileSync(pdfFile, pdf);
});
afterAll(async () => {
	await world.ctx.close();
	rmSync(scratch, { recursive: true, force: true });
});

describe('PDF/A-3b with the manifest inside', () => {
	it('carries the signed manifest as an attachment that pdfdetach extracts and that verifies', () => {
		const list = poppler('pdfdetach', ['-list', pdfFile]);
		for (const name of [BUNDLE_FILES.manifest, BUNDLE_FILES.signature, BUNDLE_FILES.publicKey])
			expect(list).toContain(name);
		const out = path.join(scratch, 'detached');
		mkdirSync(out);
		poppler('pdfdetach', ['-saveall', '-o', out, pdfFile]);
		const manifest = readFileSync(path.join(out, BUNDLE_FILES.manifest));
		expect(Buffer.compare(manifest, Buffer.from(files[BUNDLE_FILES.manifest]))).toBe(0);
		const signature = readFileSync(path.join(out, BUNDLE_FILES.signature), 'utf8').trim();
		const publicKey = readFileSync(path.join(out, BUNDLE_FILES.publicKey), 'utf8').trim();
		expect(ed25519Verifies(manifest, Buffer.from(signature, 'hex'), publicKey)).toBe(true);
		// The key is the one the manifest names: its id is the SHA-256 of the public key's bytes.
		const keyId = sha256(Buffer.from(publicKey, 'hex'));
		expect(JSON.parse(manifest.toString('utf8')).signingKeyId).toBe(keyId);
	});

	it('identifies itself as PDF/A-3b in its XMP (pdfinfo -meta) on PDF 1.7, every font embedded', () => {
		const meta = poppler('pdfinfo', ['-meta', pdfFile]);
		expect(meta).toMatch(/<pdfaid:part>3<\/pdfaid:part>/);
		expect(meta).toMatch(/<pdfaid:conformance>B<\/pdfaid:conformance>/);
		// XMP must be well-formed XML: read by Python's expat (xml.dom.minidom), namespaces on.
		const parse =
			'import sys, xml.dom.minidom as m; d = m.parseString(sys.stdin.buffer.read()); ' +
			'print(d.getElementsByTagNameNS("http://www.aiim.org/pdfa/ns/id/", "part")[0].firstChild.data)';
		const part = execFileSync('python3', ['-c', parse], { input: meta, encoding: 'utf8' });
		expect(part.trim()).toBe('3');
		expect(poppler('pdfinfo', [pdfFile])).toMatch(/^PDF version:\s+1\.7$/m);
		const fonts = popplerFonts(pdfFile);
		expect(fonts.length).toBeGreaterThan(0);
		expect(fonts.filter((f) => !f.embedded)).toEqual([]);
	});

	it('keeps the PDF/A-3 rules for associated files, output intent and metadata (ISO 19005-3; from memory)', () => {
		const objects = [...pdfObjects(pdf).values()];
		const catalog = objects.find((o) => /\/Type \/Catalog/.test(o.dict))!.dict;
		expect(catalog).toMatch(/\/AF \[(\d+ 0 R ?){3}\]/);
		expect(catalog).toMatch(/\/OutputIntents \[\d+ 0 R\]/);
		const intent = objects.find((o) => /\/Type \/OutputIntent/.test(o.dict))!.dict;
		expect(intent).toMatch(/\/S \/GTS_PDFA1/);
		const specs = objects.filter((o) => /\/Type \/Filespec/.test(o.dict)).map((o) => o.dict);
		expect(specs).toHaveLength(3);
		for (const spec of specs) expect(spec).toMatch(/\/AFRelationship \/(Source|Supplement)/);
		expect(specs.find((d) => d.includes('(manifest.json)'))).toMatch(/\/AFRelationship \/Source/);
		const embedded = objects.filter((o) => /\/Type \/EmbeddedFile/.test(o.dict)).map((o) => o.dict);
		expect(embedded).toHaveLength(3);
		for (const dict of embedded) {
			expect(dict).toMatch(/\/Subtype \/(application#2Fjson|text#2Fplain)/);
			expect(dict).toMatch(/\/ModDate \(D:\d{14}Z\)/);
		}
		// The XMP packet is readable as it stands: no filter on the metadata stream.
		const meta = objects.find((o) => /\/Type \/Metadata/.test(o.dict))!.dict;
		expect(meta).not.toMatch(/\/Filter/);
		expect(pdf.subarray(0, 15).toString('latin1')).toMatch(/^%PDF-1\.7\n%[\x80-\xff]{4}/);
	});
});
