import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	server: { host: '127.0.0.1' },
	test: {
		include: ['tests/**/*.test.ts'],
		environment: 'node',
		env: process.env.TEST_DATABASE_URL ? { DATABASE_URL: process.env.TEST_DATABASE_URL } : {},
		globalSetup: ['tests/global-setup.ts'],
		fileParallelism: false,
		testTimeout: 20000,
		hookTimeout: 30000
	}
});
