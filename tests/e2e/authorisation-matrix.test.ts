/**
 * The authorisation matrix: every page, form action and API method (found in src/routes, so a new
 * one with no row fails here by name) × every kind of caller, over real HTTP against the built app.
 * Each column has its own seeded kit; rows run top to bottom, so the ones that take things away
 * and the ones that end the session come last.
 *
 * Codes: the status, or L for a 303 to the sign-in page. Callers: anon (nobody), othr (lead of
 * another group), auth (the claim's author), lead (its group's lead), edNo / edSh (an editor the
 * claim is not / is shared with), rfOk / rfEx / rfRv (a referee with a valid, expired or revoked
 * review link, and no cookie), tkOk / tkEx / tkRv (the author's API token: valid, expired,
 * revoked; sent as a bearer header on every route), admn (an admin in no group). Callers without a
 * review link use a well-formed unknown one on review routes.
 *
 * A new route: add its line below where it belongs in the order (reads before changes, changes
 * before removals); if it has a new [parameter] or needs a body, add it in matrix-cells.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DocumentChecker, type ApiDocument } from './api-document';
import { CALLERS, cellRequest, outcome, type Caller } from './matrix-cells';
import { seedMatrixWorld, type MatrixWorld } from './matrix-world';
import { discoverRoutes } from './routes';
import { startApp, type AppServer } from './server';

const MATRIX = `
route                                           anon othr auth lead edNo edSh rfOk rfEx rfRv tkOk tkEx tkRv admn
# public pages and documents
GET /                                           200  200  200  200  200  200  200  200  200  200  200  200  200
GET /login                                      200  303  303  303  303  303  200  200  200  200  200  200  303
GET /login/orcid                                200  200  200  200  200  200  200  200  200  200  200  200  200
GET /login/orcid/start                          303  303  303  303  303  303  303  303  303  303  303  303  303
GET /login/orcid/callback                       400  400  400  400  400  400  400  400  400  400  400  400  400
GET /signup                                     200  303  303  303  303  303  200  200  200  200  200  200  303
GET /reset                                      200  200  200  200  200  200  200  200  200  200  200  200  200
GET /seal                                       200  200  200  200  200  200  200  200  200  200  200  200  200
GET /plan                                       200  200  200  200  200  200  200  200  200  200  200  200  200
GET /seal/[id]                                  200  200  200  200  200  200  200  200  200  200  200  200  200
GET /methods                                    200  200  200  200  200  200  200  200  200  200  200  200  200
GET /methods/[id]                               200  200  200  200  200  200  200  200  200  200  200  200  200
GET /invite/[token]                             200  200  200  200  200  200  200  200  200  200  200  200  200
GET /reset/[token]                              200  200  200  200  200  200  200  200  200  200  200  200  200
GET /verify/[token]                             200  200  200  200  200  200  200  200  200  200  200  200  200
GET /shared/[token]                             200  200  200  200  200  200  200  200  200  200  200  200  200
GET /api/v1/openapi.json                        200  200  200  200  200  200  200  200  200  200  200  200  200
GET /api/v1/signing-keys                        200  200  200  200  200  200  200  200  200  200  200  200  200
GET /api/v1/ledger                              200  200  200  200  200  200  200  200  200  200  200  200  200
GET /api/v1/ledger/checkpoint                   200  200  200  200  200  200  200  200  200  200  200  200  200
GET /api/v1/plan                                200  200  200  200  200  200  200  200  200  200  200  200  200
# signed-in pages
GET /account                                    L    200  200  200  200  200  L    L    L    L    L    L    200
GET /group                                      L    200  200  200  200  200  L    L    L    L    L    L    200
GET /group/[id]                                 L    404  200  200  404  404  L    L    L    L    L    L    404
GET /claims                                     L    200  200  200  200  200  L    L    L    L    L    L    200
GET /claims/new                                 L    200  200  200  200  200  L    L    L    L    L    L    200
GET /claims/[id]                                L    404  200  200  404  200  L    L    L    L    L    L    404
GET /claims/[id]/edit                           L    404  200  200  404  403  L    L    L    L    L    L    404
GET /claims/[id]/sharing                        L    404  200  200  404  403  L    L    L    L    L    L    404
GET /claims/[id]/checks/[checkId]               L    404  200  200  404  200  L    L    L    L    L    L    404
GET /claims/[id]/checks/[checkId]/counts        404  404  200  200  404  200  404  404  404  404  404  404  404
GET /claims/[id]/checks/[checkId]/result.json   404  404  200  200  404  200  404  404  404  404  404  404  404
GET /claims/[id]/certificates/[certificateId]   L    404  200  200  404  200  L    L    L    L    L    L    404
# the archive is a group's: someone in no group (editors, the admin) is told so with 403
GET /archive                                    L    200  200  200  403  403  L    L    L    L    L    L    403
GET /editor                                     L    200  200  200  200  200  L    L    L    L    L    L    200
GET /settings/tokens                            L    200  200  200  200  200  L    L    L    L    L    L    200
GET /admin/users                                L    403  403  403  403  403  L    L    L    L    L    L    200
GET /admin/outbox                               L    403  403  403  403  403  L    L    L    L    L    L    200
GET /admin/outbox/[id]                          L    403  403  403  403  403  L    L    L    L    L    L    200
GET /admin/dois                                 L    403  403  403  403  403  L    L    L    L    L    L    200
# review links
GET /review/[token]                             404  404  404  404  404  404  200  404  404  404  404  404  404
GET /api/v1/review/[token]                      404  404  404  404  404  404  200  404  404  404  404  404  404
GET /api/v1/review/[token]/bundle               404  404  404  404  404  404  200  404  404  404  404  404  404
GET /api/v1/review/[token]/checks/[checkId]     404  404  404  404  404  404  200  404  404  404  404  404  404
GET /api/v1/review/[token]/report               404  404  404  404  404  404  200  404  404  404  404  404  404
# API reads
GET /api/v1/claims                              401  200  200  200  200  200  401  401  401  200  401  401  200
GET /api/v1/claims/[id]                         401  404  200  200  404  200  401  401  401  200  401  401  404
GET /api/v1/claims/[id]/datasets                401  404  200  200  404  200  401  401  401  200  401  401  404
GET /api/v1/claims/[id]/certificates            401  404  200  200  404  200  401  401  401  200  401  401  404
GET /api/v1/claims/[id]/shares                  401  404  200  200  404  403  401  401  401  200  401  401  404
GET /api/v1/checks/[id]                         401  404  200  200  404  200  401  401  401  200  401  401  404
GET /api/v1/certificates/[id]                   401  404  200  200  404  200  401  401  401  200  401  401  404
GET /api/v1/certificates/[id]/pdf               401  404  200  200  404  200  401  401  401  200  401  401  404
GET /api/v1/certificates/[id]/bundle            401  404  200  200  404  200  401  401  401  200  401  401  404
GET /api/v1/certificates/[id]/citation          401  404  200  200  404  200  401  401  401  200  401  401  404
# the archive, as on its page: 403 for someone in no group
GET /api/v1/archive                             401  200  200  200  403  403  401  401  401  200  401  401  403
GET /api/v1/tokens                              401  200  200  200  200  200  401  401  401  403  401  401  200
# things that add
POST /login?/login                              400  303  303  303  303  303  400  400  400  400  400  400  303
POST /login/orcid?/link                         400  400  400  400  400  400  400  400  400  400  400  400  400
POST /signup?/signup                            303  303  303  303  303  303  303  303  303  303  303  303  303
POST /reset?/request                            303  303  303  303  303  303  303  303  303  303  303  303  303
POST /seal?/bundle                              200  200  200  200  200  200  200  200  200  200  200  200  200
POST /account?/resend                           L    303  303  303  303  303  L    L    L    L    L    L    303
POST /account?/unlinkOrcid                      L    303  303  303  303  303  L    L    L    L    L    L    303
POST /group/[id]?/invite                        L    404  403  303  404  404  L    L    L    L    L    L    404
POST /claims/new?/create                        L    303  303  303  403  403  L    L    L    L    L    L    403
POST /api/v1/claims                             401  201  201  201  403  403  401  401  401  201  401  401  403
POST /group?/create                             L    303  303  303  303  303  L    L    L    L    L    L    303
POST /claims/[id]/edit?/save                    L    404  303  303  404  404  L    L    L    L    L    L    404
PUT /api/v1/claims/[id]                         401  404  200  200  404  404  401  401  401  200  401  401  404
POST /claims/[id]?/upload                       L    404  303  303  404  403  L    L    L    L    L    L    404
POST /api/v1/claims/[id]/datasets               401  404  201  201  404  403  401  401  401  201  401  401  404
POST /claims/[id]?/targetRun                    L    404  400  400  404  403  L    L    L    L    L    L    404
POST /api/v1/claims/[id]/target-run             401  404  400  400  404  403  401  401  401  400  401  401  404
POST /claims/[id]?/check                        L    404  303  303  404  403  L    L    L    L    L    L    404
POST /api/v1/claims/[id]/checks                 401  404  202  202  404  403  401  401  401  202  401  401  404
POST /claims/[id]/checks/[checkId]?/issue       L    404  303  303  404  403  L    L    L    L    L    L    404
POST /api/v1/claims/[id]/certificates           401  404  201  201  404  403  401  401  401  201  401  401  404
POST /claims/[id]/sharing?/share                L    404  303  303  404  403  L    L    L    L    L    L    404
POST /api/v1/claims/[id]/shares                 401  404  201  201  404  403  401  401  401  201  401  401  404
POST /editor?/createLink                        L    404  403  403  404  200  L    L    L    L    L    L    404
POST /api/v1/claims/[id]/review-links           401  404  403  403  404  201  401  401  401  403  401  401  404
# one re-run per link at a time (429 over it), so the API re-runs through the link's twin
POST /review/[token]?/rerun                     404  404  404  404  404  404  303  404  404  404  404  404  404
POST /api/v1/review/[token]/checks              404  404  404  404  404  404  202  404  404  404  404  404  404
POST /review/[token]?/report                    404  404  404  404  404  404  303  404  404  404  404  404  404
POST /api/v1/review/[token]/report              404  404  404  404  404  404  200  404  404  404  404  404  404
POST /editor?/release                           L    404  403  403  404  200  L    L    L    L    L    L    404
POST /api/v1/reports/[id]/release               401  404  403  403  404  200  401  401  401  403  401  401  404
POST /settings/tokens?/create                   L    200  200  200  200  200  L    L    L    L    L    L    200
POST /api/v1/tokens                             401  201  201  201  201  201  401  401  401  403  401  401  201
POST /admin/outbox/[id]?/requeue                L    403  403  403  403  403  L    L    L    L    L    L    303
# the seeded certificate's DOI is waiting, being sent or registered: the admin reaches the state rule
POST /admin/dois?/retry                         L    403  403  403  403  403  L    L    L    L    L    L    409
POST /shared/[token]?/signup                    303  303  303  303  303  303  303  303  303  303  303  303  303
# the invitation goes to another address than any caller's: 403, the address masked
POST /invite/[token]?/accept                    L    403  403  403  403  403  L    L    L    L    L    L    403
POST /verify/[token]?/confirm                   L    303  303  303  303  303  L    L    L    L    L    L    303
POST /reset/[token]?/reset                      L    L    L    L    L    L    L    L    L    L    L    L    L
# things that take away (each column on its own kit)
# cancelling a finished check: allowed callers reach the state rule (409), others are refused
POST /claims/[id]/checks/[checkId]?/cancel      L    404  409  409  404  403  L    L    L    L    L    L    404
DELETE /api/v1/checks/[id]                      401  404  409  409  404  403  401  401  401  409  401  401  404
# a referee cancels only its own link's re-runs; the seeded one is done (409)
POST /review/[token]?/cancel                    404  404  404  404  404  404  409  404  404  404  404  404  404
DELETE /api/v1/review/[token]/checks/[checkId]  404  404  404  404  404  404  409  404  404  404  404  404  404
POST /claims/[id]?/removeDataset                L    404  303  303  404  403  L    L    L    L    L    L    404
DELETE /api/v1/claims/[id]/datasets/[datasetId] 401  404  204  204  404  403  401  401  401  204  401  401  404
POST /editor?/revokeLink                        L    404  403  403  404  200  L    L    L    L    L    L    404
DELETE /api/v1/review-links/[id]                401  404  403  403  404  200  401  401  401  403  401  401  404
POST /claims/[id]/sharing?/withdraw             L    404  303  303  404  403  L    L    L    L    L    L    404
DELETE /api/v1/shares/[id]                      401  404  200  200  404  403  401  401  401  200  401  401  404
POST /settings/tokens?/revoke                   L    404  303  404  404  404  L    L    L    L    L    L    404
DELETE /api/v1/tokens/[id]                      401  404  204  404  404  404  401  401  401  403  401  401  404
POST /group/[id]?/revoke                        L    404  403  303  404  404  L    L    L    L    L    L    404
POST /group/[id]?/role                          L    404  403  303  404  404  L    L    L    L    L    L    404
POST /group/[id]?/remove                        L    404  403  303  404  404  L    L    L    L    L    L    404
POST /admin/users?/role                         L    403  403  403  403  403  L    L    L    L    L    L    303
POST /archive?/withdraw                         L    404  303  303  404  403  L    L    L    L    L    L    404
# the claim page's withdraw, after the archive's: allowed callers reach "withdrawn already" (409)
POST /claims/[id]?/withdraw                     L    404  409  409  404  403  L    L    L    L    L    L    404
POST /api/v1/claims/[id]/withdraw               401  404  200  200  404  404  401  401  401  200  401  401  404
# one certificate of the claim, after the claim's withdrawal: the lead and the issuer reach "withdrawn already"
POST /api/v1/certificates/[id]/withdraw         401  404  409  409  404  403  401  401  401  403  401  401  404
# last: these end the caller's session
POST /invite/[token]?/switch                    L    L    L    L    L    L    L    L    L    L    L    L    L
POST /account?/signoutEverywhere                L    L    L    L    L    L    L    L    L    L    L    L    L
POST /account?/signout                          L    L    L    L    L    L    L    L    L    L    L    L    L
`;

interface Row {
	route: string;
	expected: string[];
}

function parseMatrix(text: string): Row[] {
	const lines = text.split('\n').filter((line) => line.trim() && !line.startsWith('#'));
	const [header, ...rows] = lines;
	expect(header.split(/\s+/).slice(1)).toEqual([...CALLERS]);
	return rows.map((line) => {
		const cells = line.trim().split(/\s+/);
		const route = cells.slice(0, 2).join(' ');
		expect(cells.length, `${route}: one code per caller`).toBe(CALLERS.length + 2);
		return { route, expected: cells.slice(2) };
	});
}

const rows = parseMatrix(MATRIX);
let app: AppServer;
let world: MatrixWorld;
let document: DocumentChecker;

beforeAll(async () => {
	world = await seedMatrixWorld(CALLERS);
	app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir });
	const served = await fetch(`${app.origin}/api/v1/openapi.json`);
	document = new DocumentChecker((await served.json()) as ApiDocument);
}, 600_000);

afterAll(async () => {
	await app?.stop();
});

describe('the authorisation matrix', () => {
	it('has one row for every page, form action and API method, and no other rows', () => {
		const listed = rows.map((row) => row.route);
		expect(new Set(listed).size, 'a route is listed twice').toBe(listed.length);
		expect([...listed].sort()).toEqual(discoverRoutes());
	});

	it('answers every caller as the table says', async () => {
		const actual: string[][] = [];
		// Columns are separate kits, so one row's callers may ask at once.
		for (const { route: row } of rows) {
			const codes = await Promise.all(
				CALLERS.map(async (caller: Caller) => {
					const { url, init } = cellRequest(app.origin, row, caller, world.kits[caller]);
					const response = await fetch(url, init);
					const body = Buffer.from(await response.arrayBuffer());
					const [method, path] = row.split(' ');
					if (path.startsWith('/api/v1/')) {
						const contentType = response.headers.get('content-type') ?? '';
						const { status } = response;
						document.check({ method, route: path, status, contentType, body });
					}
					return outcome(response);
				})
			);
			actual.push(codes);
		}
		const width = Math.max(...rows.map((row) => row.route.length)) + 1;
		const line = (route: string, codes: string[]) =>
			route.padEnd(width) +
			codes
				.map((code) => code.padEnd(4))
				.join(' ')
				.trimEnd();
		const wrong = rows
			.map((row, i) => ({ row, codes: actual[i] }))
			.filter(({ row, codes }) => codes.join() !== row.expected.join())
			.map(
				({ row, codes }) =>
					`expected ${line(row.route, row.expected)}\n     got ${line(row.route, codes)}`
			);
		expect(wrong.join('\n'), app.output().slice(-2000)).toBe('');
	}, 600_000);

	it('holds answers to the document strictly enough to catch a wrong one (control)', async () => {
		const served = await fetch(`${app.origin}/api/v1/openapi.json`);
		const control = new DocumentChecker((await served.json()) as ApiDocument);
		const answer = { method: 'GET', route: '/api/v1/claims/[id]', contentType: 'application/json' };
		control.check({ ...answer, status: 200, body: Buffer.from('{"id":"c1","title":7}') });
		control.check({ ...answer, status: 418, body: Buffer.from('{}') });
		expect(control.problems).toHaveLength(2);
		expect(control.problems[0]).toMatch(/must have required property|must be string/);
		expect(control.problems[1]).toMatch(/status not documented/);
	});

	// Runs after the matrix, on the answers it collected (OpenAPI 3.1; JSON Schema 2020-12).
	it('answers, in every documented operation, only what the OpenAPI document says', () => {
		expect(document.problems.join('\n')).toBe('');
		const unanswered = document.operations().filter((id) => !document.answered.has(id));
		expect(unanswered, 'documented operations no row asked').toEqual([]);
		// Asked here only where the state refuses them: cancelling finished checks (409), withdrawing
		// a certificate after its claim's withdrawal (409), a target run for a claim that declares its
		// λ (400). Their successes are the integration tests' (target-run-api.test.ts for the run).
		const onlyRefused = new Set([
			'cancelCheck',
			'cancelReRun',
			'withdrawCertificate',
			'addTargetRun'
		]);
		const noSuccess = [...document.answered]
			.filter(([, statuses]) => ![...statuses].some((status) => status < 300))
			.map(([id]) => id)
			.filter((id) => !onlyRefused.has(id));
		expect(noSuccess, 'documented operations never answered with success').toEqual([]);
	});
});
