/**
 * The API's calibration upload (witnesses.md §4.4): the multipart field `calibration` beside
 * `counts`, and a refused calibration answered 400 bad_input naming the field.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { readCountsUpload } from '../../src/lib/server/http/multipart';
import { problemOf } from '../../src/lib/server/http/problems';
import { checkCalibrationUpload } from '../../src/lib/server/datasets/dataset-calibration';

const url = new URL('http://127.0.0.1:3000/api/v1/claims/c1/datasets');
const post = (body: BodyInit) =>
	new Request(url, { method: 'POST', body, duplex: 'half' } as RequestInit);
const calibration = readFileSync('tests/fixtures/calibrated-d3-bases.json');
const claim = { method: 'mub-correlation' as const, dimension: 3, bases: [0, 1, 2] };

describe('a calibration through the API', () => {
	it('reads the multipart field "calibration" beside "counts"; without it there is none', async () => {
		const form = new FormData();
		form.set('counts', new Blob(['basis,outcome_a,outcome_b,counts\n']), 'run.csv');
		expect((await readCountsUpload(post(form), url)).calibration).toBeUndefined();
		form.set('calibration', new Blob([calibration]), 'bases.json');
		const upload = await readCountsUpload(post(form), url);
		expect(Buffer.from(upload.calibration!).equals(calibration)).toBe(true);
	});

	it('a calibration for the wrong method or dimension answers 400 bad_input, field calibration', () => {
		const refused = (c: Parameters<typeof checkCalibrationUpload>[1]) => {
			try {
				checkCalibrationUpload(calibration, c);
			} catch (error) {
				return problemOf(error);
			}
			return null;
		};
		expect(refused({ ...claim, method: 'steering-2mub', bases: [0, 1] })).toMatchObject({
			status: 400,
			code: 'bad_input',
			field: 'calibration'
		});
		expect(refused({ ...claim, dimension: 5 })!.message).toMatch(/\$\.dimension/);
		expect(checkCalibrationUpload(calibration, claim)!.calibrationSha256).toMatch(/^[0-9a-f]{64}$/);
	});
});
