/**
 * The evidence inside the PDF (PDF/A-3, ISO 19005-3): the signed manifest, its signature and the
 * public key as associated files, so the PDF alone carries what a reader needs to check it.
 */
import { manifestText, type EvidenceManifest } from '../../evidence/manifest';
import { BUNDLE_FILES } from '../../evidence/layout';

type Doc = PDFKit.PDFDocument;

/** PDF/A-3b on PDF 1.7; the XMP identification and sRGB output intent come from pdfkit. */
export const PDFA_OPTIONS = { subset: 'PDF/A-3b', pdfVersion: '1.7' } as const;

export interface Attached {
	manifest: EvidenceManifest;
	signature: string;
	/** The signing key's public half (hex); absent, the key file is not attached. */
	publicKey?: string;
}

export function attachEvidence(doc: Doc, input: Attached): void {
	const date = new Date(input.manifest.issuedAt);
	const files: [string, string, string, string][] = [
		[
			BUNDLE_FILES.manifest,
			manifestText(input.manifest),
			'application/json',
			'The signed manifest (RFC 8785 canonical JSON); its SHA-256 is the fingerprint.'
		],
		[
			BUNDLE_FILES.signature,
			input.signature + '\n',
			'text/plain',
			'Ed25519 signature of manifest.json, hex.'
		]
	];
	if (input.publicKey)
		files.push([
			BUNDLE_FILES.publicKey,
			input.publicKey + '\n',
			'text/plain',
			'The Ed25519 public key that signed (its SHA-256 is the signing key fingerprint), hex.'
		]);
	for (const [name, text, type, description] of files)
		// Source: the page is drawn from this manifest (ISO 32000-2 AFRelationship).
		doc.file(Buffer.from(text, 'utf8'), {
			name,
			type,
			description,
			relationship: name === BUNDLE_FILES.manifest ? 'Source' : 'Supplement',
			creationDate: date,
			modifiedDate: date
		} as PDFKit.Mixins.PDFAttachmentOptions);
}
