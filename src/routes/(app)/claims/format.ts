/** Small display helpers shared by the claim pages. */
import type { FourierConvention } from '$lib/certify';
import { dateTimeInWords } from '$lib/dates';

/** Which Fourier basis basis 1 is, in words that say which group its outcomes belong to. */
export function fourierWords(fourier: FourierConvention, d: number): string {
	return fourier === 'field'
		? `field Fourier basis (GF(${d}), base-p digit labels)`
		: `cyclic Fourier basis (ℤ_${d})`;
}

export function byteSize(bytes: number): string {
	if (bytes < 1024) return `${bytes} B`;
	if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KiB`;
	return `${(bytes / 1024 / 1024).toFixed(1)} MiB`;
}

/** The house date style (src/lib/dates.ts), kept under its old name for the claim pages. */
export const dateTime = (iso: string): string => dateTimeInWords(iso);

export const percent = (x: number) => `${+(x * 100).toFixed(3)} %`;
