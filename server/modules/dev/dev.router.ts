import { Router } from 'express';
import { z } from 'zod';
import type { AppDeps } from '../../lib/deps';
import { parseQuery } from '../../middleware/validate';
import { isLocalRequest } from '../../middleware/security';
import { modeOf } from '../../env';

const mailboxQuerySchema = z.object({ to: z.string().trim().max(254).optional() });

/**
 * /api/dev/mailbox: what the in-process SMTP sink received. Mounted only in demo mode (no
 * SMTP_URL, the sink in use), whatever NODE_ENV says: the local demo's mailbox, readable signed
 * out so a person at the machine can open their password-reset link, and only by a request from
 * this machine naming a loopback host (checked in app.ts before any route, and again here).
 * In deployment mode the route is absent.
 */
export function devRouter(deps: AppDeps): Router | null {
  const sink = deps.sink;
  if (!sink || modeOf(deps.env) !== 'demo') return null;
  const r = Router();
  r.use((req, _res, next) => (isLocalRequest(req) ? next() : next('router')));
  r.get('/mailbox', (req, res) => {
    const q = parseQuery(mailboxQuerySchema, req.query);
    const messages = (q.to ? sink.to(q.to) : sink.messages).slice().reverse();
    res.json({ messages });
  });
  return r;
}
