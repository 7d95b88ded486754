import { defineConfig, devices } from '@playwright/test';

/** The port of the app under test: fixed, so the web server and the tests agree without a shared file. */
const PORT = Number(process.env.E2E_PORT ?? 3210);
const baseURL = `http://localhost:${PORT}`;
const onCi = !!process.env.CI;
const credentialChanges = /(password-reset|passkey)\.spec\.ts$/;

/** Debian's chromium (no browser download is possible here), headless, quiet. */
const chromium = {
  ...devices['Desktop Chrome'],
  launchOptions: {
    executablePath: '/usr/bin/chromium',
    args: ['--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--no-sandbox'],
  },
};

export default defineConfig({
  testDir: 'tests/e2e',
  testMatch: '**/*.spec.ts',
  fullyParallel: false,
  workers: 1,
  forbidOnly: true,
  // One retry on CI absorbs a rare timing hiccup on a busy 2-core machine; the closing
  // reporter still names a flaky test. Locally a failure shows at once.
  retries: onCi ? 1 : 0,
  timeout: 30_000,
  expect: { timeout: 7_500 },
  reporter: [['list'], ['./tests/setup/playwright-closing-reporter.ts']],
  outputDir: 'test-results',
  use: {
    baseURL,
    trace: 'retain-on-failure',
    screenshot: 'only-on-failure',
    actionTimeout: 10_000,
    navigationTimeout: 15_000,
  },
  projects: [
    // Journeys that leave the demo data as they found it.
    { name: 'chromium', testIgnore: credentialChanges, use: chromium },
    // Journeys that change a demo account's password run last, so the others sign in as seeded.
    { name: 'chromium-credentials', testMatch: credentialChanges, dependencies: ['chromium'], use: chromium },
  ],
  webServer: {
    // The built app (NODE_ENV=production, static client) on a fresh database in a temp folder.
    command: 'npx tsx tests/e2e/start-server.ts',
    // 401 (signed out) counts as up: Playwright accepts 2xx, 3xx and 400-403.
    url: `${baseURL}/api/auth/me`,
    reuseExistingServer: false,
    timeout: 120_000,
    stdout: 'pipe',
    stderr: 'pipe',
    gracefulShutdown: { signal: 'SIGTERM', timeout: 5_000 },
    env: {
      NODE_ENV: 'production',
      PORT: String(PORT),
      HOST: '127.0.0.1',
      PUBLIC_URL: baseURL,
      MAIL_SINK_PORT: '0',
      BCRYPT_COST: '4',
      COOKIE_SECURE: 'false',
      SEED_DEMO: 'true',
    },
  },
});
