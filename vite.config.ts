import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	test: {
		projects: [
			{
				extends: true,
				test: {
					name: 'unit',
					include: ['tests/unit/**/*.test.ts', 'tests/integration/**/*.test.ts'],
					setupFiles: ['tests/own-data-folder.ts'],
					environment: 'node',
					testTimeout: 60_000
				}
			},
			{
				extends: true,
				test: {
					name: 'e2e',
					include: ['tests/e2e/**/*.test.ts'],
					environment: 'node',
					testTimeout: 120_000,
					hookTimeout: 180_000,
					fileParallelism: false
				}
			}
		]
	}
});
