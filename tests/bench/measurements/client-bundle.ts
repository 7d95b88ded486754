import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { spawnSync } from 'node:child_process';
import { gzipSync } from 'node:zlib';
import type { Measurement } from '../lib/measurement';

const GOAL_KB = 150;

/** The scripts a first visit loads before anything else: the entry module and its modulepreloads. */
export function firstLoadScripts(html: string): string[] {
  const srcs = new Set<string>();
  for (const m of html.matchAll(/<script\b[^>]*\btype=["']module["'][^>]*>/gi)) {
    const src = /\bsrc=["']([^"']+)["']/i.exec(m[0]);
    if (src) srcs.add(src[1]);
  }
  for (const m of html.matchAll(/<link\b[^>]*>/gi)) {
    if (!/\brel=["']modulepreload["']/i.test(m[0])) continue;
    const href = /\bhref=["']([^"']+)["']/i.exec(m[0]);
    if (href) srcs.add(href[1]);
  }
  return [...srcs];
}

/** Gzip size (node:zlib, default level, as a server compressing on the fly sends it) of the first-load JavaScript. */
export const clientBundle: Measurement = {
  name: 'client first-load JavaScript (gzip)',
  async run({ root }) {
    const dist = join(root, 'dist/client');
    const indexHtml = join(dist, 'index.html');
    if (!existsSync(indexHtml)) {
      console.log('  dist/client is missing: building the client...');
      const r = spawnSync('npx', ['vite', 'build', '--logLevel', 'warn'], { cwd: root, stdio: 'inherit' });
      if (r.status !== 0) throw new Error('vite build failed');
    }
    const scripts = firstLoadScripts(readFileSync(indexHtml, 'utf8'));
    if (scripts.length === 0) throw new Error('no module script found in dist/client/index.html');
    let raw = 0;
    let gz = 0;
    for (const src of scripts) {
      const file = resolve(dist, '.' + new URL(src, 'http://x/').pathname);
      const body = readFileSync(file);
      const size = gzipSync(body).length;
      raw += body.length;
      gz += size;
      console.log(`  ${src}: ${(body.length / 1024).toFixed(1)} kB raw, ${(size / 1024).toFixed(1)} kB gzip`);
    }
    const kb = gz / 1024;
    return [
      { label: 'first-load JS files', value: String(scripts.length) },
      { label: 'first-load JS raw', value: `${(raw / 1024).toFixed(1)} kB` },
      { label: 'first-load JS gzip', value: `${kb.toFixed(1)} kB`, goal: `<= ${GOAL_KB} kB`, met: kb <= GOAL_KB },
    ];
  },
};
