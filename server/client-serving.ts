import express, { type RequestHandler } from 'express';
import { existsSync } from 'node:fs';
import { resolve, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
export const clientDist = resolve(root, 'dist/client');

/** The built client: hashed assets cached for a year, index.html for every other path (`/{*splat}`). */
export function staticClient(): RequestHandler[] {
  if (!existsSync(resolve(clientDist, 'index.html'))) {
    throw new Error('The client is not built. Run `npm run build` (or `npm start`, which builds it).');
  }
  const assets = express.static(clientDist, {
    index: false,
    setHeaders(res, path) {
      if (path.includes('/assets/')) res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
    },
  });
  const router = express.Router();
  router.use(assets);
  router.get('/{*splat}', (_req, res) => {
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(resolve(clientDist, 'index.html'));
  });
  return [router];
}

/** Vite in middleware mode with hot reload, for `npm run dev`. */
export async function viteClient(): Promise<RequestHandler[]> {
  const { createServer } = await import('vite');
  const vite = await createServer({ root, server: { middlewareMode: true }, appType: 'custom' });
  const { readFile } = await import('node:fs/promises');
  const fallback: RequestHandler = async (req, res, next) => {
    try {
      const template = await readFile(resolve(root, 'index.html'), 'utf8');
      const html = await vite.transformIndexHtml(req.originalUrl, template);
      res.status(200).setHeader('Content-Type', 'text/html').end(html);
    } catch (e) {
      vite.ssrFixStacktrace(e as Error);
      next(e);
    }
  };
  const router = express.Router();
  router.use(vite.middlewares);
  router.get('/{*splat}', fallback);
  return [router];
}
