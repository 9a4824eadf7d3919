/**
 * The group archive against a real SQLite file and data folder: versions from certificates and
 * later work, withdrawal with a reason (ledger, public lookup, notices), filters, CSV and JSON.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { archiveFilterSchema } from '../../src/lib/archive/schema';
import { bundleVerifier } from '../../src/lib/server/evidence/verifier-file';
import { groupArchive } from '../../src/lib/server/claims/archive';
import { archiveCsv, archiveJson, csvField } from '../../src/lib/server/claims/archive-export';
import { lookupCertificate } from '../../src/lib/server/certificates/certificate-reads';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { updateClaim } from '../../src/lib/server/claims/claim-edit';
import { withdrawClaim } from '../../src/lib/server/claims/claim-withdraw';
import { startCheck } from '../../src/lib/server/checks/checks';
import { removeDataset } from '../../src/lib/server/datasets/dataset-removal';
import { addDataset } from '../../src/lib/server/datasets/datasets';
import { createClaim, listClaims } from '../../src/lib/server/claims/claims';
import { REACHABLE_CLAIM_STATES } from '../../src/lib/claims/states';
import { ConflictError, ForbiddenError, NotFoundError } from '../../src/lib/server/core/errors';
import { FieldError } from '../../src/lib/server/core/field-error';
import { verifyLedger } from '../../src/lib/server/ledger/ledger-verify';
import { problemOf } from '../../src/lib/server/http/problems';
import { asUser } from './actors';
import { addUser, claimFields } from './backend-fixtures';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

// Safety limits for bundling and issuing on a busy machine, not speed checks.
vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

let world: EvidenceWorld;
let verifierFolder: string;
let other: string;
const filter = (query: Record<string, string>) => archiveFilterSchema.parse(query);

beforeAll(async () => {
	world = await evidenceWorld();
	verifierFolder = mkdtempSync(path.join(tmpdir(), 'rankseal-verifier-test-'));
	process.env.RANKSEAL_VERIFIER = await bundleVerifier(path.join(verifierFolder, 'verify.mjs'));
	const claim = await createClaim(world.database, world.lead, {
		...claimFields,
		title: 'Frequency bins, "run 7", second try',
		sourceDescription: '=HYPERLINK("http://evil.example","click")',
		dimension: 7,
		method: 'steering-2mub',
		manuscriptReference: 'PRX-2026-0415'
	});
	other = claim.id;
	// Another group's claim: never in this group's archive.
	await createClaim(world.database, world.outsider, { ...claimFields, title: 'Ridge claim' });
});
afterAll(async () => {
	await world.ctx.close();
	rmSync(verifierFolder, { recursive: true, force: true });
});

/** RFC 4180 §2, read character by character: quoted fields, "" inside quotes, CRLF rows. */
function parseCsv(text: string): string[][] {
	const rows: string[][] = [];
	let row: string[] = [];
	let field = '';
	let quoted = false;
	for (let i = 0; i < text.length; i++) {
		const c = text[i];
		if (quoted) {
			if (c === '"' && text[i + 1] === '"') ((field += '"'), i++);
			else if (c === '"') quoted = false;
			else field += c;
		} else if (c === '"') quoted = true;
		else if (c === ',') (row.push(field), (field = ''));
		else if (c === '\r' && text[i + 1] === '\n') {
			(row.push(field), rows.push(row), (row = []), (field = ''), i++);
		} else field += c;
	}
	if (field || row.length) (row.push(field), rows.push(row));
	return rows;
}

describe('versions', () => {
	it('counts each certificate as a version and later work as an uncertified next one', async () => {
		const first = await finishedCheck(world, 1);
		const v1 = await issueCertificate(world.database, world.author, world.claimId, first.id);
		const second = await finishedCheck(world, 2);
		let archive = await groupArchive(world.database, world.author, filter({}));
		let claim = archive.claims.find((c) => c.id === world.claimId)!;
		expect(claim.versions.map((v) => [v.version, v.status, v.certificateId])).toEqual([
			[1, 'valid', v1.id],
			[2, 'uncertified', null]
		]);
		expect(claim.versions[1].checkId).toBe(second.id);
		const v2 = await issueCertificate(world.database, world.author, world.claimId, second.id);
		archive = await groupArchive(world.database, world.author, filter({}));
		claim = archive.claims.find((c) => c.id === world.claimId)!;
		expect(claim.versions.map((v) => [v.version, v.status, v.certificateId])).toEqual([
			[1, 'superseded', v1.id],
			[2, 'valid', v2.id]
		]);
		expect(claim.versions[1].certifiedSchmidtNumber).toBe(second.result.certifiedSchmidtNumber);
		// One notice per issue to the author and the lead, written in the issuing transaction.
		const kinds = (await world.database.models.OutboxMail.findAll()).map((m) => m.get('kind'));
		expect(kinds.filter((k) => k === 'certificate-issued')).toHaveLength(2);
		expect(kinds.filter((k) => k === 'certificate-superseded')).toHaveLength(2);
		expect(archive.claims.map((c) => c.title)).not.toContain('Ridge claim');
		await expect(
			groupArchive(world.database, world.outsider, filter({ group: archive.group.id }))
		).rejects.toBeInstanceOf(NotFoundError);
	});
});

describe('callers in no group', () => {
	it('are refused with 403 saying why, for their own archive and any named one', async () => {
		const newcomer = asUser(await addUser(world.database, 'Nia Newcomer'));
		const editor = asUser(await addUser(world.database, 'Eda Kern'), 'editor');
		const admin = asUser(await addUser(world.database, 'Ola Admin'), 'admin');
		const lakeGroup = (await groupArchive(world.database, world.lead, filter({}))).group.id;
		for (const caller of [newcomer, editor, admin])
			for (const query of [{}, { group: lakeGroup }] as Record<string, string>[]) {
				const refused = await groupArchive(world.database, caller, filter(query)).catch((e) => e);
				expect(refused).toBeInstanceOf(ForbiddenError);
				expect(problemOf(refused)).toMatchObject({
					status: 403,
					code: 'forbidden',
					message: expect.stringMatching(/^You belong to no group, so there is no group archive/)
				});
			}
	});
});

describe('filters', () => {
	const titles = async (query: Record<string, string>) =>
		(await groupArchive(world.database, world.lead, filter(query))).claims.map((c) => c.id).sort();

	it('by state, method, dimension, free text and date', async () => {
		const both = [world.claimId, other].sort();
		expect(await titles({})).toEqual(both);
		expect(await titles({ state: 'certified' })).toEqual([world.claimId]);
		expect(await titles({ method: 'steering-2mub' })).toEqual([other]);
		expect(await titles({ dimension: '5' })).toEqual([world.claimId]);
		expect(await titles({ q: 'prx-2026' })).toEqual([other]);
		expect(await titles({ q: 'isotropic source' })).toEqual([world.claimId]);
		expect(await titles({ q: '100%_' })).toEqual([]);
		// Days taken from the rows themselves, so the test holds across midnight.
		const days = (await groupArchive(world.database, world.lead, filter({}))).claims
			.map((c) => c.createdAt.slice(0, 10))
			.sort();
		const dayAfter = (d: string) => new Date(Date.parse(d) + 86_400_000).toISOString().slice(0, 10);
		expect(await titles({ from: days[0], to: days.at(-1)! })).toEqual(both);
		expect(await titles({ from: dayAfter(days.at(-1)!) })).toEqual([]);
		expect(
			await titles({ to: new Date(Date.parse(days[0]) - 86_400_000).toISOString().slice(0, 10) })
		).toEqual([]);
	});

	it('refuses a bad filter naming the field', () => {
		const bad = archiveFilterSchema.safeParse({ from: '2026-13-45', dimension: 'x' });
		expect(bad.success).toBe(false);
		const fields = bad.error!.issues.map((i) => i.path.join('.'));
		expect(fields).toEqual(expect.arrayContaining(['from', 'dimension']));
		expect(archiveFilterSchema.safeParse({ from: '2026-02-01', to: '2026-01-01' }).success).toBe(
			false
		);
	});
});

describe('exports', () => {
	it('quotes and defuses single fields', () => {
		// RFC 4180 §2.6–2.7: fields with commas, quotes or line breaks are quoted, quotes doubled.
		expect(csvField('a,b')).toBe('"a,b"');
		expect(csvField('say "yes"')).toBe('"say ""yes"""');
		expect(csvField('two\r\nlines')).toBe('"two\r\nlines"');
		// OWASP CSV injection: =, +, -, @, tab and CR first get a leading apostrophe (common practice).
		for (const text of ['=1+1', '+1', '-1', '@A1', '\tx', '\rx'])
			expect(csvField(text).replace(/^"/, '').startsWith(`'`), JSON.stringify(text)).toBe(true);
		expect(csvField(-1)).toBe('-1');
		expect(csvField(null)).toBe('');
		expect(csvField('plain')).toBe('plain');
	});

	it('writes CSV that parses back, one row per version, formulas defused', async () => {
		const archive = await groupArchive(world.database, world.lead, filter({}));
		const rows = parseCsv(archiveCsv(archive));
		const [header, ...body] = rows;
		expect(header.slice(0, 3)).toEqual(['claim_id', 'title', 'state']);
		expect(body).toHaveLength(3);
		for (const row of body) expect(row).toHaveLength(header.length);
		const cell = (row: string[], name: string) => row[header.indexOf(name)];
		const stranger = body.find((r) => cell(r, 'claim_id') === other)!;
		expect(cell(stranger, 'title')).toBe('Frequency bins, "run 7", second try');
		// A leading apostrophe keeps a spreadsheet from running it (OWASP CSV injection: common practice).
		expect(cell(stranger, 'source')).toBe(`'=HYPERLINK("http://evil.example","click")`);
		expect(cell(stranger, 'version')).toBe('');
		const versions = body.filter((r) => cell(r, 'claim_id') === world.claimId);
		expect(versions.map((r) => [cell(r, 'version'), cell(r, 'version_status')])).toEqual([
			['1', 'superseded'],
			['2', 'valid']
		]);
	});

	it('writes JSON with every claim and its versions', async () => {
		const archive = await groupArchive(
			world.database,
			world.lead,
			filter({ method: 'mub-correlation' })
		);
		const parsed = JSON.parse(archiveJson(archive));
		expect(parsed.format).toBe('rankseal-archive/1');
		expect(parsed.filter).toMatchObject({ method: 'mub-correlation' });
		expect(parsed.claims).toHaveLength(1);
		expect(parsed.claims[0].versions).toHaveLength(2);
		expect(parsed.claims[0].sourceDescription).toBe(claimFields.sourceDescription);
	});
});

describe('withdrawing a claim', () => {
	it('needs a lead or the author, and a reason of 3 to 500 characters', async () => {
		await expect(
			withdrawClaim(world.database, world.outsider, world.claimId, 'not mine')
		).rejects.toBeInstanceOf(NotFoundError);
		await expect(
			withdrawClaim(world.database, world.author, other, 'the lead’s claim')
		).rejects.toBeInstanceOf(ForbiddenError);
		await expect(withdrawClaim(world.database, world.lead, world.claimId, ' x ')).rejects.toSatisfy(
			(e) => e instanceof FieldError && e.field === 'reason'
		);
		expect((await world.database.models.Claim.findByPk(world.claimId))!.get('state')).toBe(
			'certified'
		);
	});

	it('withdraws every certificate on the ledger; the public lookup says withdrawn, and why', async () => {
		const reason = 'Detector 3 was saturated; the counts overstate visibility.';
		const queuedBefore = await world.database.models.OutboxMail.count();
		const { withdrawnCertificates } = await withdrawClaim(
			world.database,
			world.author,
			world.claimId,
			reason
		);
		expect(withdrawnCertificates).toHaveLength(2);
		for (const id of withdrawnCertificates) {
			const lookup = await lookupCertificate(world.database, id);
			expect(lookup).toMatchObject({ status: 'withdrawn', withdrawal: { reason } });
		}
		expect(await verifyLedger(world.database)).toMatchObject({ valid: true });
		const archive = await groupArchive(world.database, world.lead, filter({ state: 'withdrawn' }));
		expect(archive.claims.map((c) => [c.id, c.withdrawnReason])).toEqual([[world.claimId, reason]]);
		// The claim list finds it by state, and its filter offers that state.
		const listed = await listClaims(world.database, world.author, { state: 'withdrawn' });
		expect(listed.items.map((c) => [c.id, c.state])).toEqual([[world.claimId, 'withdrawn']]);
		expect(REACHABLE_CLAIM_STATES).toContain(listed.items[0].state);
		// The author and the lead each get one notice, written with the withdrawal.
		const notices = await world.database.models.OutboxMail.findAll({
			where: { kind: 'claim-withdrawn' }
		});
		expect(notices).toHaveLength(2);
		expect(await world.database.models.OutboxMail.count()).toBe(queuedBefore + 2);
		expect(notices[0].get('text')).toContain(reason);
		await expect(
			withdrawClaim(world.database, world.lead, world.claimId, 'again')
		).rejects.toBeInstanceOf(ConflictError);
	});

	it('takes no new counts, corrections, checks or certificates once withdrawn, and stays withdrawn', async () => {
		// A check that finished after the withdrawal (it was running when the claim was withdrawn).
		const late = await finishedCheck(world, 3);
		const { database, author, lead, claimId, datasetId } = world;
		const bytes = new TextEncoder().encode('basis,a,b,count\n0,0,0,1\n');
		const refusals = [
			() => issueCertificate(database, author, claimId, late.id),
			() => startCheck(database, author, claimId, { datasetId, resamples: 100 }),
			() => addDataset(database, lead, claimId, { bytes, originalName: 'late.csv' }),
			() => updateClaim(database, author, claimId, { ...claimFields, title: 'Renamed' }),
			() => removeDataset(database, lead, claimId, datasetId)
		];
		for (const refusal of refusals) {
			await expect(refusal()).rejects.toSatisfy(
				(e) => e instanceof ConflictError && /withdrawn .*Detector 3 was saturated/.test(e.message)
			);
		}
		const claim = (await database.models.Claim.findByPk(claimId))!;
		expect(claim.get('state')).toBe('withdrawn');
		expect(claim.get('title')).not.toBe('Renamed');
		expect(await database.models.Certificate.count({ where: { checkId: late.id } })).toBe(0);
		expect(await verifyLedger(database)).toMatchObject({ valid: true });
	});
});
