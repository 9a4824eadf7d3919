/** The first place where two JSON values differ, as a path like `statistic.lower` or `bounds[2].bound`. */
export function firstDifference(expected: unknown, actual: unknown, path = ''): string | null {
	if (Object.is(expected, actual)) return null;
	const bothObjects =
		typeof expected === 'object' &&
		typeof actual === 'object' &&
		expected !== null &&
		actual !== null &&
		Array.isArray(expected) === Array.isArray(actual);
	if (!bothObjects) return path || '(the whole value)';
	if (Array.isArray(expected) && Array.isArray(actual)) {
		for (let i = 0; i < Math.max(expected.length, actual.length); i++) {
			const found = firstDifference(expected[i], actual[i], `${path}[${i}]`);
			if (found) return found;
		}
		return null;
	}
	const a = expected as Record<string, unknown>;
	const b = actual as Record<string, unknown>;
	for (const key of [...new Set([...Object.keys(a), ...Object.keys(b)])].sort()) {
		const found = firstDifference(a[key], b[key], path ? `${path}.${key}` : key);
		if (found) return found;
	}
	return null;
}

/** Result fields added without an engine version change (calibrated bases, witnesses.md §4.4). */
const LATER_RESULT_FIELDS = ['calibration', 'calibrationTolerance'];

/** The re-run without the later fields a result recorded before them lacks (a copy). */
export function alignedRerun(recorded: object, rerun: object): Record<string, unknown> {
	const out = { ...(rerun as Record<string, unknown>) };
	for (const key of LATER_RESULT_FIELDS) if (!(key in recorded)) delete out[key];
	return out;
}
