/**
 * Several counts files in one upload through the claim page in Chromium (issue 18): two bare
 * d × d grids, chosen together, each with its basis typed beside it, become one
 * dataset whose preview says how each file was read; a bad second file is named with its line.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sampledCounts, states } from '../../src/lib/certify';
import { openPages, type PagesSession } from './pages-session';

let session: PagesSession;
let page: Page;

beforeAll(async () => {
	session = await openPages();
	page = session.page;
});
afterAll(async () => {
	await session?.close();
});

const d = 7;
const data = sampledCounts(states.isotropic(d, 0.92), [0, 1], 50_000, 4713);

/** Basis t as a lab's sheet: d tab-separated rows, no basis line. */
const bareGrid = (t: number) =>
	Array.from({ length: d }, (_, a) =>
		[...data.tables[t].counts.subarray(a * d, a * d + d)].join('\t')
	).join('\n') + '\n';

/** Both files chosen at once, as a file dialog's multiple selection gives them. */
async function pick(files: [string, string][]) {
	await page.setInputFiles(
		'input[name=counts]',
		files.map(([name, text]) => ({
			name,
			mimeType: 'text/tab-separated-values',
			buffer: Buffer.from(text)
		}))
	);
}

describe.each([1366, 390])('two grid files with their bases at %i px', (width) => {
	it('a bad second file is refused naming it and its line; fixed, both are one dataset', async () => {
		await session.signedInAs('lead');
		// A demo steering claim: d = 7 on bases 0 and 1.
		const claim = session.claims.find((c) => c.method === 'steering-2mub')!;
		await session.visit(`/claims/${claim.id}`, `claim-two-grids-${width}`, width);
		const typo = bareGrid(1).split('\n');
		typo[2] = typo[2].replace(/^(\d+)\t/, '$1\tq');
		await pick([
			[`h-${width}.tsv`, bareGrid(0)],
			[`v-${width}.tsv`, typo.join('\n')]
		]);
		const fields = page.locator('[data-testid=basis-input]');
		expect(await fields.count()).toBe(2);
		await fields.nth(0).fill('0');
		await fields.nth(1).fill('1');
		const chosenWidth = await page.evaluate(() => document.documentElement.scrollWidth);
		expect(chosenWidth).toBeLessThanOrEqual(width);
		if (process.env.RANKSEAL_KEEP_SCREENSHOTS)
			await page.locator('[data-testid=upload-form]').screenshot({
				path: `${process.env.RANKSEAL_KEEP_SCREENSHOTS}/two-grids-chosen-${width}.png`
			});
		await page.click('form[action="?/upload"] button');
		await page.locator('[data-testid=upload-error]').waitFor();
		expect(await page.textContent('[data-testid=upload-error-line]')).toBe('Line 3, column 2');
		expect(await page.textContent('[data-testid=upload-error]')).toContain(
			`in v-${width}.tsv (file 2 of 2): counts must be a non-negative whole number, got 'q`
		);
		// The refused files stay chosen with their bases; chosen again with the fixed copy.
		expect(await fields.nth(1).inputValue()).toBe('1');
		await pick([
			[`h-${width}.tsv`, bareGrid(0)],
			[`v-${width}.tsv`, bareGrid(1)]
		]);
		await fields.nth(0).fill('0');
		await fields.nth(1).fill('1');
		await page.click('form[action="?/upload"] button');
		// The page may show an earlier dataset's preview: wait for the new one's address.
		await page.waitForURL(/\?dataset=/, { timeout: 0 });
		await page.locator('[data-testid=read-as]').waitFor();
		expect(await page.textContent('[data-testid=read-as]')).toBe(
			`The file was read as 2 files — h-${width}.tsv: 1 grid of 7 × 7 in basis 0 (given with the upload), tab-separated; ` +
				`v-${width}.tsv: 1 grid of 7 × 7 in basis 1 (given with the upload), tab-separated.`
		);
		const wide = await page.evaluate(() => document.documentElement.scrollWidth);
		expect(wide).toBeLessThanOrEqual(width);
	});
});
