/**
 * POST /api/v1/certificates/{id}/withdraw: one certificate withdrawn by its group's lead or its
 * issuer, the reason on the ledger, the claim left as it was; 404 for a caller who cannot see it,
 * 400 naming the field for a reason too short, 409 the second time.
 */
import type { RequestEvent } from '@sveltejs/kit';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Actor } from '../../src/lib/server/core/actor';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { listLedger } from '../../src/lib/server/ledger/ledger';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for issuing on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

const withdrawApi = await import('../../src/routes/api/v1/certificates/[id]/withdraw/+server');

let world: EvidenceWorld;
beforeAll(async () => (world = await evidenceWorld()));
afterAll(async () => world?.ctx.close());

function event(actor: Actor, id: string, body: unknown): never {
	const url = `http://localhost/api/v1/certificates/${id}/withdraw`;
	const headers = { 'content-type': 'application/json' };
	const request = new Request(url, { method: 'POST', body: JSON.stringify(body), headers });
	const locals = { actor, user: null, session: null };
	return { locals, url: new URL(url), params: { id }, request } as never;
}

async function answer(actor: Actor, id: string, body: unknown) {
	const response = (await withdrawApi.POST(event(actor, id, body) as RequestEvent)) as Response;
	return { status: response.status, body: await response.json() };
}

describe('withdrawing one certificate through the API', () => {
	it('lets the lead withdraw it with a reason on the ledger, and leaves the claim certified', async () => {
		const check = await finishedCheck(world, 61);
		const cert = await issueCertificate(world.database, world.author, world.claimId, check.id);
		const hidden = await answer(world.outsider, cert.id, { reason: 'Not mine to judge.' });
		expect(hidden).toMatchObject({ status: 404, body: { error: { code: 'not_found' } } });
		const short = await answer(world.lead, cert.id, { reason: 'no' });
		expect(short).toMatchObject({ status: 400, body: { error: { field: 'reason' } } });

		const done = await answer(world.lead, cert.id, { reason: 'The gate delay was mis-set.' });
		expect(done).toMatchObject({ status: 200, body: { id: cert.id, status: 'withdrawn' } });
		const last = (await listLedger(world.database, 1, 200)).items.at(-1)!;
		expect(last).toMatchObject({ event: 'withdraw', certificateId: cert.id });
		expect(JSON.parse(last.payload).details.reason).toBe('The gate delay was mis-set.');
		const claim = await world.database.models.Claim.findByPk(world.claimId);
		expect(claim!.get('state')).toBe('certified');

		const again = await answer(world.author, cert.id, { reason: 'Withdrawn twice?' });
		expect(again).toMatchObject({ status: 409, body: { error: { code: 'conflict' } } });
	});
});
