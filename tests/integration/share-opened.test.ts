/**
 * A share reads "opened" only once the editor opened the notice's link, not as soon as it is made
 * for an editor who already has an account (issue 18).
 */
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { openShare } from '../../src/lib/server/review/share-open';
import { listShares, shareClaim } from '../../src/lib/server/review/shares';
import { asUser } from './actors';
import { linkToken } from './mail-world';
import { reviewWorld, type ReviewWorld } from './review-world';

vi.setConfig({ testTimeout: 600_000, hookTimeout: 600_000 });

let w: ReviewWorld;
beforeAll(async () => {
	w = await reviewWorld();
});
afterAll(async () => w.close());

describe('opened', () => {
	it('is false for an editor with an account until they open the link, then true', async () => {
		const author = asUser(w.author);
		const editor = asUser(w.editor, 'editor');
		await shareClaim(w.mail.database, author, w.claimId, {
			email: w.editorEmail,
			journal: 'Journal of Invented Optics',
			manuscript: 'JIO-2026-002'
		});
		const [made] = await listShares(w.mail.database, author, w.claimId);
		expect(made.opened).toBe(false);
		const token = await linkToken(w.mail, w.editorEmail, '/shared/');
		expect(await openShare(w.mail.database, editor, token)).toBe(w.claimId);
		const [after] = await listShares(w.mail.database, author, w.claimId);
		expect(after.opened).toBe(true);
	});
});
