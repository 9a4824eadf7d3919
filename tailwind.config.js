/** Rankseal's own palette: paper, ink, a wax-seal red and an oxidised-copper green. */
/** @type {import('tailwindcss').Config} */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			colors: {
				paper: '#f7f3ea',
				ink: '#1f2430',
				rule: '#d9d1c0',
				seal: { DEFAULT: '#8c2f25', light: '#b85a4c', dark: '#5e1d17' },
				copper: { DEFAULT: '#2f6f66', light: '#5d9c92', dark: '#1d4a44' },
				amber: { DEFAULT: '#b7791f' }
			},
			fontFamily: {
				serif: ['"Noto Serif"', 'Georgia', 'serif'],
				mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace']
			}
		}
	}
};
