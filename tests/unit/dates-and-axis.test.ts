/** The house date style against Intl (a general-purpose reference), and the ladder axis ticks. */
import { describe, expect, it } from 'vitest';
import { dateTimeInWords, dayInWords } from '../../src/lib/dates';
import { niceStep, ticks } from '../../src/lib/server/evidence/pdf-axis';

describe('dates in words', () => {
	it('agrees with Intl in UTC whatever the local zone', () => {
		for (const iso of ['2026-12-05T23:59:00Z', '2024-02-29T00:00:00Z', '1999-01-01T12:34:56Z']) {
			const intl = new Date(iso).toLocaleDateString('en-GB', {
				timeZone: 'UTC',
				day: 'numeric',
				month: 'long',
				year: 'numeric'
			});
			expect(dayInWords(iso)).toBe(intl);
		}
		expect(dateTimeInWords('2026-12-05T03:04:59Z')).toBe('5 December 2026, 03:04 UTC');
	});
});

describe('axis ticks', () => {
	// Steps of 1, 2 or 5 times a power of ten: the "nice numbers" of Heckbert, Graphics Gems (1990).
	it('steps by 1, 2 or 5 × 10^n and stays inside the range', () => {
		expect(niceStep(1.84)).toBe(0.5);
		expect(niceStep(0.07)).toBe(0.01);
		expect(niceStep(9)).toBe(2);
		expect(ticks(0, 1.84)).toEqual([0, 0.5, 1, 1.5]);
		expect(ticks(-0.13, 0.42)).toEqual([-0.1, 0, 0.1, 0.2, 0.3, 0.4]);
	});
});
