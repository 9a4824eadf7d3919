/** The claims pager's words at the edges (issue 7 §5: "page 99 of 2", "1961–28 of 28", "0–0 of 0"). */
import { describe, expect, it } from 'vitest';
import { pagePlace, pageStatus } from '../../src/routes/(app)/claims/pager';

// Expected values worked out by hand: items (page − 1)·size + 1 … min(total, page·size).
describe('pager', () => {
	it('states the range and the page inside the list', () => {
		expect(pageStatus(1, 20, 28)).toBe('1–20 of 28 claims, page 1 of 2');
		expect(pageStatus(2, 20, 28)).toBe('21–28 of 28 claims, page 2 of 2');
		expect(pageStatus(1, 20, 1)).toBe('1 of 1 claim');
		expect(pageStatus(3, 1, 3)).toBe('3 of 3 claims, page 3 of 3');
	});

	it('says an empty list is empty, not "0–0 of 0"', () => {
		expect(pageStatus(1, 20, 0)).toBe('No claims to show');
		expect(pagePlace(1, 20, 0)).toEqual({ pages: 1, range: null, pastTheEnd: false });
	});

	it('says a page past the end is past the end, not "page 99 of 2" or "1961–28 of 28"', () => {
		expect(pageStatus(99, 20, 28)).toBe('Page 99 is past the end: 28 claims fill 2 pages');
		expect(pagePlace(99, 20, 28)).toEqual({ pages: 2, range: null, pastTheEnd: true });
		expect(pageStatus(2, 20, 20)).toBe('Page 2 is past the end: 20 claims fill 1 page');
	});
});
