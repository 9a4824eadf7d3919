/**
 * The one command line that reproduces a check from its counts file: every setting the result
 * records, so that `--json` prints the same numbers as the check's result.
 */
import type { CertificationResult } from '../certify/certify';

/** POSIX shell quoting: bare when safe, else single quotes with each ' written as '\''. */
export function shellWord(word: string): string {
	return /^[A-Za-z0-9._\/+=:,-]+$/.test(word) ? word : `'${word.replaceAll("'", `'\\''`)}'`;
}

/** The calibration file's name in the evidence bundle, where a calibrated check's file is found. */
export const CALIBRATION_ARGUMENT = 'calibration.json';

export function reproduceCommand(
	result: CertificationResult,
	countsFile: string,
	calibrationFile = CALIBRATION_ARGUMENT
): string {
	const options: [string, string | number | null][] = [
		['--counts', shellWord(countsFile)],
		['--dimension', result.dimension],
		['--method', result.method],
		['--bases', result.bases.join(',')],
		['--fourier', result.fourier],
		['--confidence', result.confidence],
		['--resamples', result.resamples],
		['--seed', result.seed]
	];
	if (result.claim) options.push(['--claim', result.claim.schmidtNumber]);
	if (result.backgroundSubtracted) options.push(['--subtract-accidentals', null]);
	if (result.calibration) options.push(['--calibration', shellWord(calibrationFile)]);
	options.push(['--json', null]);
	const words = options.map(([name, value]) => (value === null ? name : `${name} ${value}`));
	return ['npm run --silent certify --', ...words].join(' ');
}
