/**
 * The archive in the built app, as a signed-in lead: filters in the address (a bad one named
 * beside its field), the CSV download, and withdrawal through the API showing on the page.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { seedFlowWorld, type FlowWorld } from './flow-world';
import { startApp, type AppServer } from './server';

// Safety limits on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 120_000, hookTimeout: 120_000 });

let world: FlowWorld;
let app: AppServer;
let claimId: string;

beforeAll(async () => {
	world = await seedFlowWorld();
	app = await startApp({ RANKSEAL_DATA_DIR: world.dataDir });
});
afterAll(async () => app?.stop());

const asLead = (path: string, init: RequestInit = {}) =>
	fetch(`${app.origin}${path}`, {
		...init,
		headers: {
			cookie: `rankseal_session=${world.outsiderSession}`,
			origin: app.origin,
			'content-type': 'application/json',
			...(init.headers ?? {})
		}
	});

describe('the archive', () => {
	it('lists a new claim and finds it by manuscript; a bad filter is named', async () => {
		const created = await asLead('/api/v1/claims', {
			method: 'POST',
			body: JSON.stringify({
				title: 'Archive probe, "quoted"',
				sourceDescription: '@SUM(A1) from the bench',
				dimension: 5,
				method: 'steering-2mub',
				claimedSchmidtNumber: 3,
				manuscriptReference: 'OPT-77'
			})
		});
		expect(created.status, await created.clone().text()).toBe(201);
		claimId = (await created.json()).id;
		const found = await (await asLead('/archive?q=opt-77')).text();
		expect(found).toContain('Archive probe, "quoted"');
		const none = await (await asLead('/archive?q=no-such-manuscript')).text();
		expect(none).toContain('No claim matches these filters.');
		const bad = await (await asLead('/archive?dimension=many')).text();
		expect(bad).toContain('Dimension must be a number.');
	});

	it('downloads the archive as CSV with a file name, formulas defused', async () => {
		const response = await asLead('/api/v1/archive?format=csv&download=1');
		expect(response.headers.get('content-type')).toMatch(/^text\/csv/);
		expect(response.headers.get('content-disposition')).toMatch(
			/^attachment; filename="rankseal-archive-.+\.csv"$/
		);
		const csv = await response.text();
		expect(csv.startsWith('claim_id,title,state,')).toBe(true);
		// A leading apostrophe before @ (OWASP CSV injection: common practice).
		expect(csv).toContain(`,'@SUM(A1) from the bench,`);
		expect((await fetch(`${app.origin}/api/v1/archive`)).status).toBe(401);
	});

	it('withdraws the claim with a reason, which the archive then shows', async () => {
		const reason = 'Mislabelled bases in run 2.';
		const response = await asLead(`/api/v1/claims/${claimId}/withdraw`, {
			method: 'POST',
			body: JSON.stringify({ reason })
		});
		expect(response.status).toBe(200);
		expect(await response.json()).toMatchObject({ state: 'withdrawn', withdrawnCertificates: [] });
		const page = await (await asLead('/archive?state=withdrawn')).text();
		expect(page).toContain(reason);
		const again = await asLead(`/api/v1/claims/${claimId}/withdraw`, {
			method: 'POST',
			body: JSON.stringify({ reason })
		});
		expect(again.status).toBe(409);
	});
});
