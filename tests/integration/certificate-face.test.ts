/**
 * The certificate's face: every character a title, name or source may hold prints with a real
 * glyph (checked in the embedded fonts' programs, not in the text layer), page one carries what a
 * referee looks for, dates are in words with UTC, the rungs are r, and page two is not near-empty.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { issueCertificate } from '../../src/lib/server/certificates/certificates';
import { certificateFile } from '../../src/lib/server/certificates/certificate-reads';
import { embeddedGlyphs, popplerFonts } from '../pdf-glyphs';
import { evidenceWorld, finishedCheck, type EvidenceWorld } from './evidence-world';

vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

const TITLE = 'Schmidt number ≥ 4 with ≤ 2 % loss, ±0.3 nm × 5 bins, |ψ⟩ = Σ αᵢ|ii⟩';
const SOURCE =
	'Type-II SPDC in ppKTP (Λ = 46.1 μm) at 405 nm; λ/2 plates; T ≈ 25 °C; H₂O-cooled, 10⁻³ mbar; Ωτ ≪ 1; ⟨n⟩ ≤ 0.01; measured by Øystein Næss, Zoë Šimůnek and Chloé Dvořák';
const GROUP = 'Halvorsen Lake Photonics — Ærø façade lab';
const NAME = 'Ólafur Þórsson-Łukasiewicz';
const EXTRA = 'ÀÉÎÕÜàéîõüçñßøåæœ ΓΔΘΛΞΠΣΦΨΩ αβγδεζηθικλμνξπρστυφχψω ₀₁₂₃₄₅₆₇₈₉ ⁰¹²³⁴⁵⁶⁷⁸⁹ ≥≤±×⟩⟨';

let world: EvidenceWorld;
let folder: string;
let pdf: Buffer;
let pdfFile: string;
let layout: string;

beforeAll(async () => {
	world = await evidenceWorld();
	folder = mkdtempSync(path.join(tmpdir(), 'rankseal-face-'));
	const { Claim, Group, User } = world.database.models;
	const claim = (await Claim.findByPk(world.claimId))!;
	await claim.update({ title: TITLE, sourceDescription: `${SOURCE} ${EXTRA}` });
	const groupId = claim.get('groupId') as string;
	await Group.update({ name: GROUP }, { where: { id: groupId } });
	await User.update({ name: NAME }, { where: { id: world.author.userId } });
	const check = await finishedCheck(world, 5);
	const cert = await issueCertificate(world.database, world.lead, world.claimId, check.id);
	pdf = (await certificateFile(world.database, world.author, cert.id, 'pdf')).bytes;
	pdfFile = path.join(folder, 'c.pdf');
	writeFileSync(pdfFile, pdf);
	layout = execFileSync('pdftotext', ['-layout', pdfFile, '-'], { encoding: 'utf8' });
});
afterAll(async () => {
	await world.ctx.close();
	rmSync(folder, { recursive: true, force: true });
});

describe('glyphs', () => {
	it('embeds every font it uses (pdffonts)', () => {
		const fonts = popplerFonts(pdfFile);
		expect(fonts.length).toBeGreaterThan(0);
		expect(fonts.filter((f) => !f.embedded)).toEqual([]);
	});

	it('draws every character of the title, group, names and source with a real glyph', () => {
		const fonts = embeddedGlyphs(pdf);
		const drawn = new Set(fonts.flatMap((f) => [...f.drawn]));
		const blank = new Set(fonts.flatMap((f) => [...f.blank]));
		const wanted = new Set([...`${TITLE}${SOURCE}${GROUP}${NAME}${EXTRA}`].filter((c) => c.trim()));
		// Every wanted character was written (the source is clipped, EXTRA is short enough to stay).
		expect([...wanted].filter((c) => !drawn.has(c))).toEqual([]);
		expect([...blank].filter((c) => c.trim())).toEqual([]);
	});
});

describe('what a referee looks for', () => {
	it('shows the group, authors, source, counts file, coincidences per basis, visibility and key fingerprint', () => {
		const oneLine = layout.replace(/\s+/g, ' ');
		expect(oneLine).toContain('Halvorsen Lake Photonics');
		expect(oneLine).toMatch(/Authors: .*Ólafur Þórsson-Łukasiewicz.*Ada Lind/);
		expect(oneLine).toContain('Type-II SPDC in ppKTP');
		expect(oneLine).toMatch(/Counts file: run3\.csv \(csv, [\d,]+ bytes\)/);
		expect(oneLine).toMatch(/basis 0: [\d,]+; basis 1: [\d,]+/);
		expect(oneLine).toMatch(/Effective visibility: 0\.\d{3}/);
		expect(oneLine).toMatch(/Signing key fingerprint \(SHA-256 of its public key\): [0-9a-f]{64}/);
	});

	it('writes dates in words with UTC, not ISO', () => {
		expect(layout).toMatch(/Issued: \d{1,2} [A-Z][a-z]+ \d{4}, \d\d:\d\d UTC/);
		expect(layout).not.toMatch(/\d{4}-\d\d-\d\dT\d\d:/);
	});

	it('calls the rungs r, never k, and labels the lower bound on a numeric axis', () => {
		expect(layout).toMatch(/r ?= ?1\b/);
		expect(layout).not.toMatch(/\bk = \d/);
		expect(layout).toMatch(/rung r \(Schmidt number ≤ r\)/);
		expect(layout).toMatch(/lower bound \d/);
		// At least three round tick values on the axis line under the rungs.
		expect(layout).toMatch(/(?:^|\n)\s*(?:-?\d+(?:\.\d+)?\s+){3,}/);
	});
});

describe('pages', () => {
	it('has two pages and the second one is more than half used', () => {
		const bbox = execFileSync('pdftotext', ['-bbox', pdfFile, '-'], { encoding: 'utf8' });
		const pages = bbox.split('<page ').slice(1);
		expect(pages).toHaveLength(2);
		const height = Number(/height="([\d.]+)"/.exec(pages[1])![1]);
		// The footer sits at the page foot: the lowest word above it says how far the content goes.
		const bottoms = [...pages[1].matchAll(/yMax="([\d.]+)">([^<]*)</g)]
			.filter(
				([, , word]) => !/^(page|of|·|Certificate)$/.test(word) && !/^[0-9a-f-]{20,}$/.test(word)
			)
			.map(([, y]) => Number(y))
			.filter((y) => y < height - 40);
		expect(Math.max(...bottoms)).toBeGreaterThan(height / 2);
	});
});
