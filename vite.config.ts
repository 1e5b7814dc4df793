import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	test: {
		expect: { requireAssertions: true },
		projects: [
			{
				extends: true,
				test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' }
			},
			{
				extends: true,
				test: {
					name: 'api',
					include: ['tests/api/**/*.test.ts'],
					environment: 'node',
					testTimeout: 30_000,
					hookTimeout: 60_000
				}
			},
			{
				extends: true,
				test: {
					name: 'e2e',
					include: ['tests/e2e/**/*.test.ts'],
					environment: 'node',
					testTimeout: 60_000,
					hookTimeout: 60_000,
					// one Chromium at a time: the machine has two cores
					fileParallelism: false
				}
			}
		]
	}
});
