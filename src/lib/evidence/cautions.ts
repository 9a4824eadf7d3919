/** What a result assumes, in plain words: the PDF and README say it the way the check page does. */
import type { Trust } from '../certify/witnesses';

export function assumptionsOf(trust: Trust, backgroundSubtracted: boolean): string[] {
	return [
		'The trials are independent and identically distributed.',
		'The detected pairs are a fair sample of all pairs the source emitted.',
		trust === 'one-sided device-independent'
			? "One-sided device-independent: one side is treated as a black box; only the other side's measurements must be calibrated in the declared bases."
			: 'Device-dependent: both sides measured calibrated projections in the declared bases; the method trusts the devices.',
		backgroundSubtracted
			? 'Background-subtracted: accidental estimates were removed before normalising.'
			: 'Raw counts: the counts were used as recorded; no background was subtracted.',
		'A certificate informs peer review; it is not a substitute for it.'
	];
}
