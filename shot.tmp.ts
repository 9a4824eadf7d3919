// Scratch: screenshots of the dev server. Deleted before finishing.
import { launchBrowser } from './tests/e2e/browser';
const [, , ...specs] = process.argv;
const b = await launchBrowser();
const page = await b.context.newPage();
const errors: string[] = [];
page.on('pageerror', (e) => errors.push(e.message));
page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
for (const spec of specs) {
	const [path, file, selector, width] = spec.split('|');
	if (width) await page.setViewportSize({ width: Number(width), height: 900 });
	await page.goto('http://localhost:5185' + path, { waitUntil: 'networkidle' });
	await page.waitForTimeout(1500);
	if (selector) {
		await page.waitForSelector(selector, { timeout: 60000 });
		await page.locator(selector).first().screenshot({ path: `/tmp/polish-shots/${file}.png` });
	} else await page.screenshot({ path: `/tmp/polish-shots/${file}.png`, fullPage: true });
	console.log(file, await page.locator('[data-rung]').count(), await page.locator('[data-point]').count());
}
console.log('errors', errors);
await b.close();
