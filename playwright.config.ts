import { defineConfig } from '@playwright/test';

const port = Number(process.env.E2E_PORT ?? 4183);

// Debian's Chromium, never a downloaded browser (STACK.md). The app runs from `node build`
// against the seeded e2e database prepared by scripts/test.mjs.
export default defineConfig({
	testDir: 'tests/e2e',
	testMatch: '**/*.spec.ts',
	workers: 1,
	retries: 0,
	timeout: 30_000,
	expect: { timeout: 7_000 },
	reporter: [['list']],
	use: {
		baseURL: `http://127.0.0.1:${port}`,
		launchOptions: {
			executablePath: '/usr/bin/chromium',
			args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync']
		}
	},
	webServer: {
		command: 'node build',
		url: `http://127.0.0.1:${port}/healthz`,
		reuseExistingServer: false,
		timeout: 60_000,
		env: {
			PORT: String(port),
			ORIGIN: `http://127.0.0.1:${port}`,
			HOST: '127.0.0.1',
			DATABASE_URL: process.env.DATABASE_URL ?? '',
			MAIL_FAKE_PORT: process.env.MAIL_FAKE_PORT ?? '2535',
			MAIL_TRANSPORT: 'fake',
			APP_BASE_URL: `http://127.0.0.1:${port}`,
			NOTIFY_INTERVAL_MS: '300'
		}
	}
});
