/**
 * The required structure of an RO-Crate 1.1 metadata file (https://w3id.org/ro/crate/1.1,
 * sections "RO-Crate Metadata File", "Root Data Entity" and "Data Entities"), checked against the
 * files of a real bundle. Returns what is wrong, one line each; [] when nothing.
 */
import { createHash } from 'node:crypto';

type Entity = Record<string, unknown>;
const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');
const ids = (value: unknown): string[] =>
	(Array.isArray(value) ? value : [value]).map((v) => (v as { '@id'?: string })?.['@id'] ?? '');
const typesOf = (e: Entity) => (Array.isArray(e['@type']) ? e['@type'] : [e['@type']]);

/** Flattened JSON-LD: a property value may reference an entity ({"@id"}) but never nest one. */
function nested(e: Entity): string[] {
	const problems: string[] = [];
	for (const [key, value] of Object.entries(e))
		for (const v of Array.isArray(value) ? value : [value])
			if (v && typeof v === 'object' && Object.keys(v).some((k) => k !== '@id'))
				problems.push(`${e['@id']}: ${key} nests an entity (the graph must be flattened)`);
	return problems;
}

function graphProblems(crate: Entity): string[] {
	const context = crate['@context'];
	const problems: string[] = [];
	if (
		typeof context !== 'string' ||
		!/^https:\/\/w3id\.org\/ro\/crate\/1\.\d+\/context$/.test(context)
	)
		problems.push('@context is not the RO-Crate 1.x context');
	const graph = crate['@graph'];
	if (!Array.isArray(graph) || graph.length === 0) return [...problems, '@graph is not a list'];
	const seen = new Set<string>();
	for (const e of graph as Entity[]) {
		if (typeof e['@id'] !== 'string' || e['@type'] === undefined)
			problems.push(`an entity without @id or @type: ${JSON.stringify(e).slice(0, 80)}`);
		if (seen.has(e['@id'] as string)) problems.push(`@id ${e['@id']} appears twice`);
		seen.add(e['@id'] as string);
		problems.push(...nested(e));
	}
	// Every local reference must name an entity of the graph (absolute URIs may point outside).
	for (const e of graph as Entity[])
		for (const [key, value] of Object.entries(e))
			for (const id of key.startsWith('@') ? [] : ids(value))
				if (id && !/^[a-z]+:/.test(id) && !seen.has(id))
					problems.push(`${e['@id']}: ${key} references ${id}, which the graph lacks`);
	return problems;
}

function rootProblems(
	graph: Entity[],
	selfName: string
): { root: Entity | null; problems: string[] } {
	// Finding the Root Data Entity, as the specification gives the algorithm.
	const descriptor = graph.find((e) => e['@id'] === selfName);
	if (!descriptor) return { root: null, problems: [`no metadata descriptor @id ${selfName}`] };
	const problems: string[] = [];
	if (!typesOf(descriptor).includes('CreativeWork'))
		problems.push('the descriptor is not a CreativeWork');
	if (!ids(descriptor.conformsTo)[0].startsWith('https://w3id.org/ro/crate/'))
		problems.push('the descriptor does not conform to an RO-Crate specification');
	const root = graph.find((e) => e['@id'] === ids(descriptor.about)[0]) ?? null;
	if (!root) return { root, problems: [...problems, 'the descriptor is about no entity'] };
	if (root['@id'] !== './') problems.push('the root data entity of an attached crate is not ./');
	if (!typesOf(root).includes('Dataset')) problems.push('the root data entity is not a Dataset');
	for (const key of ['name', 'description'])
		if (typeof root[key] !== 'string' || !root[key]) problems.push(`the root has no ${key}`);
	if (!/^\d{4}-\d{2}-\d{2}(T[\d:.]+(Z|[+-]\d{2}:\d{2}))?$/.test(String(root.datePublished)))
		problems.push('the root has no ISO 8601 datePublished');
	return { root, problems };
}

/** Every file of the bundle but the crate itself: a File entity in the root's hasPart, hash and size right. */
function fileProblems(
	graph: Entity[],
	root: Entity,
	files: Record<string, Uint8Array>,
	selfName: string
) {
	const problems: string[] = [];
	const parts = new Set(ids(root.hasPart));
	for (const [name, bytes] of Object.entries(files)) {
		if (name === selfName) continue;
		const e = graph.find((x) => x['@id'] === name);
		if (!e || !typesOf(e).includes('File')) problems.push(`${name}: no File entity`);
		else {
			if (!parts.has(name)) problems.push(`${name}: not in the root's hasPart`);
			if (e.sha256 !== undefined && e.sha256 !== sha256(bytes))
				problems.push(`${name}: wrong sha256`);
			if (e.contentSize !== undefined && Number(e.contentSize) !== bytes.byteLength)
				problems.push(`${name}: wrong contentSize`);
		}
	}
	for (const id of parts)
		if (!(id in files)) problems.push(`hasPart names ${id}, not in the bundle`);
	return problems;
}

export function crateProblems(crate: Entity, files: Record<string, Uint8Array>, selfName: string) {
	const problems = graphProblems(crate);
	if (!Array.isArray(crate['@graph'])) return problems;
	const graph = crate['@graph'] as Entity[];
	const { root, problems: rootFaults } = rootProblems(graph, selfName);
	problems.push(...rootFaults);
	if (root) problems.push(...fileProblems(graph, root, files, selfName));
	return problems;
}
