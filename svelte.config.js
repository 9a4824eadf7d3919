import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		adapter: adapter(),
		// Kit's own origin check would refuse multipart uploads from scripts (no Origin header);
		// hooks.server.ts runs the same check, letting through only bearer-token API calls.
		csrf: { trustedOrigins: ['*'] }
	}
};

export default config;
