import { existsSync, statSync, readdirSync } from 'node:fs';
import { join, resolve, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import { spawnSync } from 'node:child_process';

/** `npm start`: builds the client when it is missing or older than its sources, then starts the server. */
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const built = join(root, 'dist/client/index.html');

function newest(dir: string): number {
  let t = 0;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    t = Math.max(t, e.isDirectory() ? newest(p) : statSync(p).mtimeMs);
  }
  return t;
}

const sourcesAt = Math.max(newest(join(root, 'src')), newest(join(root, 'shared')), statSync(join(root, 'index.html')).mtimeMs);
if (!existsSync(built) || statSync(built).mtimeMs < sourcesAt) {
  console.log('Building the client...');
  const r = spawnSync('npx', ['vite', 'build', '--logLevel', 'warn'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) process.exit(r.status ?? 1);
}
process.env.NODE_ENV ??= 'production';
await import('../index');
