/**
 * ro-crate-metadata.json (RO-Crate 1.1): the bundle described for repositories and journals.
 * Every file is a File entity with its size, media type and SHA-256; the check is a CreateAction
 * whose instrument is the engine and whose result is the certificate. contents.json and
 * contents.sig are listed without a hash: they hash this file, so it cannot hash them.
 */
import { BUNDLE_FILES, type EvidenceFiles } from '../../evidence/layout';
import type { EvidenceManifest } from '../../evidence/manifest';
import { sha256Hex } from '../../evidence/hash';
import { orcidUrl } from '../../orcid-id';
import { fileWords, mediaTypeOf } from './ro-crate-files';

export const CRATE_CONTEXT = 'https://w3id.org/ro/crate/1.1/context';
export const CRATE_SPEC = 'https://w3id.org/ro/crate/1.1';

export interface CrateInput {
	manifest: EvidenceManifest;
	fingerprint: string;
	/** The files to describe with their hashes (every file but contents.json, contents.sig and this). */
	files: EvidenceFiles;
	authors: string[];
	/** Each author's ORCID iD or null, in the order of `authors`; absent when not known. */
	authorOrcids?: (string | null)[];
	/** The certificate's DOI name (10.x/y), when it has one. */
	doi?: string;
	group: string;
	verifyUrl: string;
}

type Entity = Record<string, unknown> & { '@id': string; '@type': string | string[] };
const ref = (id: string) => ({ '@id': id });

function fileEntity(name: string, bytes: Uint8Array | null): Entity {
	return {
		'@id': name,
		'@type': 'File',
		name,
		description: fileWords(name),
		encodingFormat: mediaTypeOf(name),
		...(bytes ? { contentSize: String(bytes.byteLength), sha256: sha256Hex(bytes) } : {})
	};
}

function checkAction(m: EvidenceManifest, names: string[]): Entity {
	const inputs = names.filter(
		(n) => n.startsWith('counts-') || n === 'calibration.json' || n.startsWith('calibration-run.')
	);
	return {
		'@id': `#check-${m.checkId}`,
		'@type': 'CreateAction',
		name: `Schmidt-number check ${m.checkId}`,
		description: `${m.claim.method} witness on bases ${m.claim.bases.join(', ')}, ${m.parameters.resamples} resamples, confidence ${m.parameters.confidence}, seed ${m.parameters.seed}`,
		instrument: ref(`#engine-${m.engineVersion}`),
		object: inputs.map(ref),
		result: [BUNDLE_FILES.manifest, BUNDLE_FILES.pdf, BUNDLE_FILES.result]
			.filter((n) => names.includes(n))
			.map(ref),
		endTime: m.issuedAt
	};
}

function rootDataset(input: CrateInput, names: string[], people: Entity[]): Entity {
	const m = input.manifest;
	return {
		'@id': './',
		'@type': 'Dataset',
		name: `Rankseal certificate ${m.certificateId}: ${m.claim.title}`,
		description: `Evidence for the claim of Schmidt number ${m.claim.claimedSchmidtNumber} in local dimension ${m.claim.dimension}: the counts, the signed manifest (fingerprint ${input.fingerprint}), the result, the certificate PDF and an offline verifier.`,
		datePublished: m.issuedAt,
		// RO-Crate 1.1 asks for a persistent identifier, as a URL, where there is one.
		identifier: input.doi ? `https://doi.org/${input.doi}` : m.certificateId,
		url: input.verifyUrl,
		publisher: ref('#rankseal'),
		...(people.length ? { author: people.map((p) => ref(p['@id'])) } : {}),
		sourceOrganization: ref('#group'),
		hasPart: names.map(ref),
		mentions: ref(`#check-${m.checkId}`)
	};
}

/** The crate's JSON-LD text (tab-indented, for people to read). */
export function crateText(input: CrateInput): string {
	const m = input.manifest;
	const described = Object.keys(input.files).sort();
	const unhashed = [BUNDLE_FILES.contents, BUNDLE_FILES.contentsSignature];
	const names = [...described, ...unhashed];
	// RO-Crate 1.1 recommends a person's ORCID URL as their @id; a local id otherwise.
	const people: Entity[] = input.authors.map((name, i) => {
		const orcid = input.authorOrcids?.[i];
		return { '@id': orcid ? orcidUrl(orcid) : `#author-${i + 1}`, '@type': 'Person', name };
	});
	const graph: Entity[] = [
		{
			'@id': BUNDLE_FILES.crate,
			'@type': 'CreativeWork',
			conformsTo: ref(CRATE_SPEC),
			about: ref('./')
		},
		rootDataset(input, names, people),
		...described.map((name) => fileEntity(name, input.files[name])),
		...unhashed.map((name) => fileEntity(name, null)),
		checkAction(m, names),
		{
			'@id': `#engine-${m.engineVersion}`,
			'@type': 'SoftwareApplication',
			name: 'Rankseal engine',
			version: m.engineVersion
		},
		{ '@id': '#rankseal', '@type': 'Organization', name: 'Rankseal' },
		{ '@id': '#group', '@type': 'Organization', name: input.group },
		...people
	];
	return JSON.stringify({ '@context': CRATE_CONTEXT, '@graph': graph }, null, '\t') + '\n';
}
