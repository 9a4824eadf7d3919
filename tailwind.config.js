/** Rankseal's own palette (src/lib/palette.js): paper, ink, wax-seal red, oxidised copper, amber. */
import { palette } from './src/lib/palette.js';

/** @type {import('tailwindcss').Config} */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			colors: palette,
			fontFamily: {
				serif: ['"Noto Serif"', 'Georgia', 'serif'],
				mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace']
			}
		}
	}
};
