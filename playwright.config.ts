import { defineConfig } from '@playwright/test';

// End-to-end tests against the built app (node build), in Debian's Chromium. The test command sets the
// database, SMTP and inbox addresses; APP_PORT is a free port it picked.
const port = Number(process.env.APP_PORT ?? 4173);
const origin = `http://127.0.0.1:${port}`;

export default defineConfig({
	testDir: 'e2e',
	testMatch: /.*\.e2e\.ts/,
	fullyParallel: false,
	workers: 1,
	retries: process.env.CI ? 1 : 0,
	timeout: 60_000,
	expect: { timeout: 10_000 },
	reporter: [['list']],
	outputDir: process.env.PW_OUTPUT_DIR ?? 'test-results',
	use: {
		baseURL: origin,
		trace: 'retain-on-failure',
		screenshot: 'only-on-failure',
		launchOptions: {
			executablePath: '/usr/bin/chromium',
			args: [
				'--headless',
				'--no-sandbox',
				'--disable-gpu',
				'--disable-quic',
				'--no-first-run',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync'
			]
		}
	},
	webServer: {
		command: `node ${process.env.BUILD_DIR ?? 'build'}`,
		url: `${origin}/healthz`,
		reuseExistingServer: false,
		timeout: 60_000,
		env: {
			HOST: '127.0.0.1',
			PORT: String(port),
			ORIGIN: origin,
			// CSV uploads and PDF checks on the verification page are larger than adapter-node's 512 kB default.
			BODY_SIZE_LIMIT: '25M',
			AUTH_SECRET: process.env.AUTH_SECRET ?? 'e2e-secret-not-for-production',
			DATABASE_URL: process.env.DATABASE_URL ?? '',
			SMTP_HOST: process.env.SMTP_HOST ?? '127.0.0.1',
			SMTP_PORT: process.env.SMTP_PORT ?? '2525',
			// Every test signs in from 127.0.0.1; the per-address limit stays as in production.
			SIGN_IN_PER_CLIENT: '1000',
			MAIL_FROM: process.env.MAIL_FROM ?? 'Envelo <no-reply@envelo.example.test>'
		}
	}
});
