/** The one date style of every page, mail and certificate: "5 December 2026, 03:41 UTC". */

const MONTHS = [
	'January',
	'February',
	'March',
	'April',
	'May',
	'June',
	'July',
	'August',
	'September',
	'October',
	'November',
	'December'
];

const asDate = (value: string | number | Date) => (value instanceof Date ? value : new Date(value));
const two = (n: number) => String(n).padStart(2, '0');

/** The day in words, in UTC: "5 December 2026". */
export function dayInWords(value: string | number | Date): string {
	const d = asDate(value);
	if (Number.isNaN(d.getTime())) return 'unknown date';
	return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}`;
}

/** The day in words and the time in UTC: "5 December 2026, 03:41 UTC". */
export function dateTimeInWords(value: string | number | Date): string {
	const d = asDate(value);
	if (Number.isNaN(d.getTime())) return 'unknown date';
	return `${dayInWords(d)}, ${two(d.getUTCHours())}:${two(d.getUTCMinutes())} UTC`;
}
