/**
 * The fake registry's records: create, update, read and resolve DOIs with DataCite's states
 * (draft, registered, findable) and its answers, kept in a JSON file when one is given.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { recordErrors } from './fake-registry-rules';

type State = 'draft' | 'registered' | 'findable';
interface DoiRecord {
	state: State;
	attributes: Record<string, unknown>;
	created: string;
	updated: string;
}

export type Reply = { status: number; body?: unknown; location?: string };

/** A JSON:API error answer. */
export const problem = (status: number, source: string | null, title: string): Reply => ({
	status,
	body: { errors: [{ status: String(status), ...(source ? { source } : {}), title }] }
});

const UNKNOWN = 'The resource you are looking for does not exist.';

function load(file?: string): Map<string, DoiRecord> {
	if (!file) return new Map();
	try {
		return new Map(Object.entries(JSON.parse(readFileSync(file, 'utf8'))));
	} catch {
		return new Map();
	}
}

const nextState = (event: unknown, old?: State): State =>
	event === 'publish' ? 'findable' : event === 'hide' ? 'registered' : (old ?? 'draft');

export function registryStore(file?: string) {
	const records = load(file);
	const save = () => file && writeFileSync(file, JSON.stringify(Object.fromEntries(records)));
	const view = (doi: string, r: DoiRecord) => ({
		data: {
			id: doi,
			type: 'dois',
			attributes: { ...r.attributes, doi, state: r.state, created: r.created, updated: r.updated }
		}
	});

	/** POST (creating) or PUT: merges the attributes, checking them if it is not a draft. */
	function write(doi: string, attributes: Record<string, unknown>, creating: boolean): Reply {
		const old = records.get(doi);
		if (creating && old) return problem(422, 'doi', 'This DOI has already been taken.');
		if (!creating && !old) return problem(404, null, UNKNOWN);
		const { event, ...rest } = attributes;
		const merged = { ...(old?.attributes ?? {}), ...rest, doi };
		const state = nextState(event, old?.state);
		const errors = state === 'draft' ? [] : recordErrors(merged);
		if (errors.length)
			return { status: 422, body: { errors: errors.map((e) => ({ status: '422', ...e })) } };
		const now = new Date().toISOString();
		records.set(doi, { state, attributes: merged, created: old?.created ?? now, updated: now });
		save();
		return { status: creating ? 201 : 200, body: view(doi, records.get(doi)!) };
	}

	const read = (doi: string): Reply => {
		const r = records.get(doi);
		return r ? { status: 200, body: view(doi, r) } : problem(404, null, UNKNOWN);
	};

	/** The resolver: a redirect to the registered URL; drafts do not resolve. */
	const resolve = (doi: string): Reply => {
		const r = records.get(doi);
		if (!r || r.state === 'draft') return problem(404, null, 'DOI not found.');
		return { status: 302, location: String(r.attributes.url) };
	};

	return { write, read, resolve };
}
