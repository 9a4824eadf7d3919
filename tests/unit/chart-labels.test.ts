import { describe, expect, it } from 'vitest';
import { rungLabels } from '../../src/lib/components/chart-labels';

describe('rung labels on crowded chart axes', () => {
	for (const rungs of [1, 6, 30, 126, 255]) {
		it(`${rungs} rungs: the named rungs are labelled, labels stay apart and inside the axis`, () => {
			const at = Array.from({ length: rungs }, (_, i) => 300 - (i * 280) / Math.max(1, rungs - 1));
			const always = [0, rungs - 1, Math.floor(rungs / 2)];
			const placed = rungLabels(at, always, 17, 12, 350);
			for (const i of always) expect(placed.has(i)).toBe(true);
			const positions = [...placed.values()].sort((a, b) => a - b);
			for (let k = 1; k < positions.length; k++)
				expect(positions[k] - positions[k - 1]).toBeGreaterThanOrEqual(17 - 1e-9);
			for (const p of positions) {
				expect(p).toBeGreaterThanOrEqual(12);
				expect(p).toBeLessThanOrEqual(350);
			}
		});
	}
});
