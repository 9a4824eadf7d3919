// @ts-check
/**
 * Rankseal's own palette: paper, ink, a wax-seal red, an oxidised-copper green and amber.
 * One source for the Tailwind theme and for the contrast test (tests/unit/palette.test.ts).
 */
export const palette = {
	paper: '#f7f3ea',
	ink: { DEFAULT: '#1f2430', soft: '#4d525c' },
	rule: '#d9d1c0',
	seal: { DEFAULT: '#8c2f25', light: '#b85a4c', dark: '#5e1d17' },
	copper: { DEFAULT: '#2f6f66', light: '#5d9c92', dark: '#1d4a44' },
	amber: { DEFAULT: '#b7791f', dark: '#7d5210' }
};

/**
 * Every text colour the pages use, on every background it is used on; a background given as
 * [colour, alpha] is that colour laid over paper (e.g. bg-seal/5). Each must reach WCAG AA.
 * @type {{ text: string, on: string | [string, number], where: string }[]}
 */
export const textPairs = [
	{ text: 'ink', on: 'paper', where: 'body text' },
	{ text: 'ink-soft', on: 'paper', where: 'secondary text, captions, table headings' },
	{ text: 'ink-soft', on: ['#ffffff', 0.6], where: 'form fields (bg-white/60)' },
	{ text: 'ink-soft', on: ['seal', 0.05], where: 'failure and verdict panels' },
	{ text: 'ink-soft', on: ['copper', 0.1], where: 'supported verdict panel' },
	{ text: 'ink-soft', on: ['amber', 0.1], where: 'warnings and the address note' },
	{ text: 'seal', on: 'paper', where: 'links, errors, lower bound' },
	{ text: 'seal', on: ['seal', 0.05], where: 'not-supported panel' },
	{ text: 'copper-dark', on: ['copper', 0.1], where: 'supported badge and panel' },
	{ text: 'copper', on: 'paper', where: 'cleared-rung markers text' },
	{ text: 'amber-dark', on: 'paper', where: 'unconfirmed, in preparation' },
	{ text: 'paper', on: 'amber-dark', where: 'the Simulated label' },
	{ text: 'paper', on: 'seal', where: 'buttons' },
	{ text: 'paper', on: 'seal-dark', where: 'buttons, hovered' },
	{ text: 'paper', on: 'ink', where: 'the skip link' }
];
