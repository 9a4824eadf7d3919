/**
 * How the authorisation matrix asks each route: who the caller is (cookie, bearer token or review
 * link), what fills each [parameter], and the body an unsafe method or form action sends. Each
 * caller kind has its own kit (matrix-world.ts), so a route that succeeds changes only its column.
 */
import { sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import type { Kit } from './matrix-world';

export const CALLERS = [
	...['anon', 'othr', 'auth', 'lead', 'edNo', 'edSh', 'rfOk'],
	...['rfEx', 'rfRv', 'tkOk', 'tkEx', 'tkRv', 'admn']
] as const;
export type Caller = (typeof CALLERS)[number];

type Body =
	| { form: Record<string, string> }
	| { multipart: Record<string, string | Blob> }
	| { json: unknown }
	| { text: string; type: string };

/** A well-formed review token that no link has. */
const UNKNOWN_LINK = 'rvw_' + 'A'.repeat(43);

/** The session cookie, bearer token or review link the caller brings (referees: only the link). */
function credentials(caller: Caller, kit: Kit): { cookie?: string; bearer?: string } {
	const people = { othr: kit.other, auth: kit.author, lead: kit.lead, admn: kit.admin };
	const editors = { edNo: kit.stranger, edSh: kit.editor };
	const who = { ...people, ...editors }[caller as keyof typeof people];
	if (who) return { cookie: `rankseal_session=${who.session}` };
	const tokens = { tkOk: kit.tokens.valid, tkEx: kit.tokens.expired, tkRv: kit.tokens.revoked };
	const token = tokens[caller as keyof typeof tokens];
	return token ? { bearer: token.token } : {};
}

function reviewToken(route: string, caller: Caller, kit: Kit): string {
	if (route === 'POST /api/v1/review/[token]/checks' && caller === 'rfOk')
		return kit.links.second.token;
	const links = { rfOk: kit.links.valid, rfEx: kit.links.expired, rfRv: kit.links.revoked };
	return links[caller as keyof typeof links]?.token ?? UNKNOWN_LINK;
}

/** What fills [name] in each route (longest prefix first); a new route needs its line here. */
function params(route: string, caller: Caller, kit: Kit): Record<string, string> {
	const table: [string, Record<string, string>][] = [
		['POST /claims/[id]/checks/[checkId]?/issue', { id: kit.claimId, checkId: kit.checks[1] }],
		// Edits go to the uncertified claim: a certified one is corrected, not edited (409).
		['POST /api/v1/claims/[id]/withdraw', { id: kit.spareClaimId }],
		['PUT /api/v1/claims/[id]', { id: kit.spareClaimId }],
		['POST /claims/[id]/edit?/save', { id: kit.spareClaimId }],
		['/claims/[id]', { id: kit.claimId, checkId: kit.checks[0], certificateId: kit.certificateId }],
		['/api/v1/claims/[id]/datasets/', { id: kit.claimId, datasetId: kit.spareDatasets[1] }],
		['/api/v1/claims/[id]', { id: kit.claimId }],
		['/api/v1/certificates/[id]', { id: kit.certificateId }],
		['/methods/[id]', { id: 'steering-2mub' }],
		['/api/v1/checks/[id]', { id: kit.checks[0] }],
		['/api/v1/reports/[id]', { id: kit.reports[0] }],
		['/api/v1/review-links/[id]', { id: kit.spareLinks[0].id }],
		['/api/v1/shares/[id]', { id: kit.openShares[1].id }],
		['/api/v1/tokens/[id]', { id: kit.tokens.spare[0].id }],
		['/api/v1/review/[token]', { token: reviewToken(route, caller, kit), checkId: kit.rerun }],
		['/review/[token]', { token: reviewToken(route, caller, kit) }],
		['/admin/outbox/[id]', { id: kit.mailId }],
		['/group/[id]', { id: kit.lake }],
		['/seal/[id]', { id: kit.certificateId }],
		['/invite/[token]', { token: kit.invitations[0].token }],
		['/reset/[token]', { token: kit.resetToken }],
		['/verify/[token]', { token: kit.verifyToken }],
		['/shared/[token]', { token: kit.openShares[0].token }]
	];
	const path = route.split(' ')[1];
	const hit = table.find(([prefix]) => route === prefix || path.startsWith(prefix));
	return hit?.[1] ?? {};
}

const counts = sampledCounts(states.isotropic(5, 0.9), [0, 1, 2], 40_000, 23);
const csv = (note: string) => toCountsCsv(counts, [note]);
const claimFields = {
	...{ title: 'Matrix claim', sourceDescription: 'Simulated pairs.', dimension: 5 },
	...{ method: 'mub-correlation', claimedSchmidtNumber: 3 }
};
const password = 'a long enough pass phrase 42';

/** The body of each unsafe request that needs one; `who` keeps created addresses apart. */
function body(route: string, caller: Caller, kit: Kit): Body | undefined {
	const who = `${caller}.${kit.tag}`.toLowerCase();
	const share = { email: `ed2.${who}@example.test`, journal: 'J. M.', manuscript: 'M-2' };
	const bodies: Record<string, () => Body> = {
		'POST /admin/dois?/retry': () => ({ form: { certificateId: kit.certificateId } }),
		'POST /admin/users?/role': () => ({ form: { userId: kit.spare.id, role: 'editor' } }),
		'POST /api/v1/claims': () => ({ json: { ...claimFields, bases: [0, 1, 2] } }),
		'PUT /api/v1/claims/[id]': () => ({ json: { ...claimFields, bases: [0, 1, 2] } }),
		'POST /api/v1/claims/[id]/certificates': () => ({ json: { checkId: kit.checks[2] } }),
		'POST /api/v1/claims/[id]/checks': () => ({
			json: { datasetId: kit.datasetId, resamples: 100 }
		}),
		'POST /api/v1/claims/[id]/datasets': () => ({ text: csv(`api ${who}`), type: 'text/csv' }),
		// The matrix's claim declares no calibration run: members are refused by name (400).
		'POST /api/v1/claims/[id]/target-run': () => ({ text: csv(`run ${who}`), type: 'text/csv' }),
		'POST /api/v1/claims/[id]/review-links': () => ({ json: { label: 'second referee' } }),
		'POST /api/v1/claims/[id]/shares': () => ({ json: share }),
		'POST /api/v1/certificates/[id]/withdraw': () => ({ json: { reason: 'Matrix withdrawal.' } }),
		'POST /api/v1/claims/[id]/withdraw': () => ({ json: { reason: 'Matrix withdrawal.' } }),
		'POST /api/v1/review/[token]/checks': () => ({ json: { seed: 9 } }),
		'POST /api/v1/review/[token]/report': () => ({
			json: { recommendation: 'sound', comments: 'Fine.', submit: false }
		}),
		'POST /api/v1/tokens': () => ({ json: { name: 'matrix' } }),
		'POST /archive?/withdraw': () => ({ form: { claimId: kit.claimId, reason: 'Matrix.' } }),
		'POST /claims/[id]/edit?/save': () => ({ form: { ...claimFields, bases: '0,1,2' } as never }),
		'POST /claims/[id]/sharing?/share': () => ({ form: share }),
		'POST /claims/[id]/sharing?/withdraw': () => ({ form: { shareId: kit.openShares[2].id } }),
		'POST /claims/[id]?/withdraw': () => ({ form: { reason: 'Matrix.', confirm: 'yes' } }),
		'POST /claims/[id]?/check': () => ({ form: { datasetId: kit.datasetId, resamples: '100' } }),
		'POST /claims/[id]?/removeDataset': () => ({ form: { datasetId: kit.spareDatasets[0] } }),
		'POST /claims/[id]?/upload': () => ({
			multipart: { counts: new File([csv(`page ${who}`)], 'upload.csv', { type: 'text/csv' }) }
		}),
		'POST /claims/[id]?/targetRun': () => ({
			multipart: { targetRun: new File([csv(`run ${who}`)], 'run.csv', { type: 'text/csv' }) }
		}),
		'POST /claims/new?/create': () => ({ form: { ...claimFields, bases: '0,1,2' } as never }),
		'POST /editor?/createLink': () => ({ form: { claimId: kit.claimId, label: 'third' } }),
		'POST /editor?/release': () => ({ form: { reportId: kit.reports[1] } }),
		'POST /editor?/revokeLink': () => ({ form: { linkId: kit.spareLinks[1].id } }),
		'POST /group/[id]?/invite': () => ({
			form: { email: `inv.${who}@example.test`, role: 'author' }
		}),
		'POST /group/[id]?/remove': () => ({ form: { userId: kit.spare.id } }),
		'POST /group/[id]?/revoke': () => ({ form: { invitationId: kit.invitations[1].id } }),
		'POST /group/[id]?/role': () => ({ form: { userId: kit.spare.id, role: 'lead' } }),
		'POST /group?/create': () => ({ form: { name: `Group of ${who}` } }),
		'POST /login?/login': () => ({
			form: { email: kit.other.email, password: 'wrong password 1' }
		}),
		'POST /reset/[token]?/reset': () => ({ form: { password, confirm: password } }),
		'POST /reset?/request': () => ({ form: { email: kit.other.email } }),
		'POST /review/[token]?/report': () => ({
			form: { recommendation: 'sound', comments: 'Fine.', intent: 'save' }
		}),
		'POST /review/[token]?/rerun': () => ({ form: { seed: '9' } }),
		'POST /review/[token]?/cancel': () => ({ form: { checkId: kit.rerun } }),
		'POST /seal?/bundle': () => ({
			multipart: { bundle: new File(['not a zip'], 'bundle.zip', { type: 'application/zip' }) }
		}),
		'POST /settings/tokens?/create': () => ({ form: { name: 'matrix', expiresInDays: '30' } }),
		'POST /settings/tokens?/revoke': () => ({ form: { tokenId: kit.tokens.spare[1].id } }),
		'POST /shared/[token]?/signup': () => ({ form: { name: 'New Editor', password } }),
		'POST /signup?/signup': () => ({
			form: { name: 'New Person', email: `new.${who}@example.test`, password }
		})
	};
	return bodies[route]?.();
}

/** Query strings of the reads that need one (the planner answers 400 without its question). */
const QUERIES: Record<string, string> = {
	'GET /api/v1/plan':
		'?method=steering-2mub&dimension=4&schmidtNumber=4&visibility=0.97&simulate=none'
};

/** The request for one cell, with [parameters] filled; throws naming a parameter with no value. */
export function cellRequest(origin: string, route: string, caller: Caller, kit: Kit) {
	const [method, template] = route.split(' ');
	const values = params(route, caller, kit);
	const path = template.replace(/\[(\w+)\]/g, (_, name: string) => {
		if (!values[name]) throw new Error(`${route}: no value for [${name}] in matrix-cells.ts`);
		return values[name];
	});
	const headers: Record<string, string> = { origin, accept: 'text/html,application/json' };
	const { cookie, bearer } = credentials(caller, kit);
	if (cookie) headers.cookie = cookie;
	if (bearer) headers.authorization = `Bearer ${bearer}`;
	const given = body(route, caller, kit);
	let payload: BodyInit | undefined;
	if (given && 'form' in given) payload = new URLSearchParams(given.form);
	else if (given && 'multipart' in given) {
		payload = new FormData();
		for (const [key, value] of Object.entries(given.multipart)) payload.append(key, value);
	} else if (given && 'json' in given) {
		headers['content-type'] = 'application/json';
		payload = JSON.stringify(given.json);
	} else if (given && 'text' in given) {
		headers['content-type'] = given.type;
		payload = given.text;
	} else if (method !== 'GET' && template.includes('?/')) payload = new URLSearchParams();
	return {
		url: origin + path + (QUERIES[route] ?? ''),
		init: { method, headers, body: payload, redirect: 'manual' as const }
	};
}

/** The compact code of an answer: L for a redirect to sign-in, else the status. */
export function outcome(response: Response): string {
	const location = response.headers.get('location') ?? '';
	if (response.status >= 300 && response.status < 400 && location.startsWith('/login')) return 'L';
	return String(response.status);
}
