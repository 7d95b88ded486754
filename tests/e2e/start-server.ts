import { existsSync, mkdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { spawnSync } from 'node:child_process';

/**
 * Starts the built app for Playwright on a fresh database: the temp folder is deleted first,
 * so every run starts from the seeded demo scenario. Builds the client when it is missing
 * (npm test builds it before Playwright; this covers `npm run test:e2e` on a clean clone).
 */
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const port = process.env.PORT ?? '3210';
const dir = join(tmpdir(), `fieldproof-e2e-${port}`);
rmSync(dir, { recursive: true, force: true });
mkdirSync(dir, { recursive: true });

process.env.DATABASE_PATH = join(dir, 'e2e.sqlite');
process.env.STORAGE_DIR = join(dir, 'files');
process.env.NODE_ENV ??= 'production';

if (!existsSync(join(root, 'dist/client/index.html'))) {
  console.log('Building the client for the end-to-end tests...');
  const r = spawnSync('npx', ['vite', 'build', '--logLevel', 'warn'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) process.exit(r.status ?? 1);
}

const cleanUp = () => rmSync(dir, { recursive: true, force: true });
process.on('exit', cleanUp);

await import('../../server/index');
