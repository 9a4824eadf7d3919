import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		adapter: adapter(),
		// Kit's own origin check would refuse multipart uploads from scripts (no Origin header);
		// hooks.server.ts runs a stricter one (every unsafe method), letting through bearer API calls.
		csrf: { trustedOrigins: ['*'] },
		// @stdlib's generator probe calls eval(), which the CSP below refuses (and reports).
		alias: { '@stdlib/assert-has-generator-support': 'src/lib/shims/has-generator-support.cjs' },
		// Kit hashes or nonces its own inline scripts; everything else comes from this origin only.
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				// Style attributes (Svelte's style: directives, transitions) cannot be hashed; scripts can.
				'style-src': ['self', 'unsafe-inline'],
				// The heat maps draw on a canvas and show it as a data: PNG inside their SVG.
				'img-src': ['self', 'data:'],
				'font-src': ['self'],
				'connect-src': ['self'],
				'worker-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		}
	}
};

export default config;
