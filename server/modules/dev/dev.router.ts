import { Router } from 'express';
import { z } from 'zod';
import type { AppDeps } from '../../lib/deps';
import { parseQuery } from '../../middleware/validate';

const mailboxQuerySchema = z.object({ to: z.string().trim().max(254).optional() });

/**
 * /api/dev/mailbox: what the in-process SMTP sink received. Mounted only when that sink is in
 * use (no SMTP_URL configured): it is the local demo's mailbox, readable signed out so a person
 * can open their password-reset link. With a real mail server configured the route is absent.
 */
export function devRouter(deps: AppDeps): Router | null {
  const sink = deps.sink;
  if (!sink || deps.env.SMTP_URL) return null;
  const r = Router();
  r.get('/mailbox', (req, res) => {
    const q = parseQuery(mailboxQuerySchema, req.query);
    const messages = (q.to ? sink.to(q.to) : sink.messages).slice().reverse();
    res.json({ messages });
  });
  return r;
}
