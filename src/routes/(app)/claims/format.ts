/** Small display helpers shared by the claim pages. */
import type { FourierConvention } from '$lib/certify';

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

export function dateTime(iso: string): string {
	return new Date(iso).toLocaleString('en-GB', {
		day: 'numeric',
		month: 'short',
		year: 'numeric',
		hour: '2-digit',
		minute: '2-digit',
		timeZone: 'UTC',
		timeZoneName: 'short'
	});
}

export const percent = (x: number) => `${+(x * 100).toFixed(3)} %`;
