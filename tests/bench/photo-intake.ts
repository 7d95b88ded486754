/**
 * Speed of evidence intake: one 12-megapixel JPEG through the whole intake (magic bytes, SHA-256,
 * perceptual hash, EXIF, auto-rotated thumbnail), in milliseconds; and uploads per second at 4
 * concurrent clients through the real HTTP API (multipart, checks, durable write, commit).
 * Run alone: `npx tsx tests/bench/photo-intake.ts`.
 */
import sharp from 'sharp';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { fileURLToPath } from 'node:url';
import { intakeFile } from '../../server/lib/photo/intake';
import { makeTestApp } from '../factories/test-app';
import { sceneSvg, exifOf } from '../fixtures/photos';
import type { Figure, Measurement } from './lib/measurement';

export interface PhotoIntakeResult {
  bytes: number;
  megapixels: number;
  runs: number;
  medianMs: number;
  p90Ms: number;
  minMs: number;
  stagesMs: { type: number; hashes: number; exif: number; thumbnail: number };
  uploads: number;
  seconds: number;
  uploadsPerSecond: number;
  concurrency: number;
}

/** A 4000 × 3000 JPEG with camera-like noise and EXIF (capture time, offset, GPS), made here. */
export async function twelveMegapixelJpeg(): Promise<Buffer> {
  const width = 4000;
  const height = 3000;
  const noise = await sharp({ create: { width, height, channels: 3, background: '#808080', noise: { type: 'gaussian', mean: 128, sigma: 18 } } }).png().toBuffer();
  return sharp(Buffer.from(sceneSvg(4242, width, height)))
    .composite([{ input: noise, blend: 'soft-light' }])
    .jpeg({ quality: 90 })
    .withExif(exifOf({ takenAt: '2026:03:11 10:15:00', offset: '-06:00', latitude: 37.69, longitude: -97.34 }))
    .toBuffer();
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const pct = (xs: number[], p: number) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(xs.length * p))];

export async function measurePhotoIntake(opts: { runs?: number; seconds?: number; concurrency?: number } = {}): Promise<PhotoIntakeResult> {
  const runs = opts.runs ?? 10;
  const seconds = opts.seconds ?? 10;
  const concurrency = opts.concurrency ?? 4;
  const jpeg = await twelveMegapixelJpeg();
  const meta = await sharp(jpeg).metadata();

  for (let i = 0; i < 2; i++) await intakeFile(jpeg, 'warmup.jpg');
  const totals: number[] = [];
  const stages = { type: 0, hashes: 0, exif: 0, thumbnail: 0 };
  for (let i = 0; i < runs; i++) {
    const r = await intakeFile(jpeg, 'bench.jpg');
    totals.push(r.timingsMs.total);
    for (const k of Object.keys(stages) as (keyof typeof stages)[]) stages[k] += r.timingsMs[k] / runs;
  }

  // Uploads through the API: a real app on a temp SQLite file and local storage, over loopback.
  // intake speed is measured here, at 4 concurrent clients of one user; the per-user limit on
  // uploads in progress has its own tests, so it is lifted to the bench's concurrency
  const t = await makeTestApp({ env: { UPLOAD_MAX_CONCURRENT_PER_USER: '8', UPLOAD_MAX_FILES_PER_CLAIM: '1000000', UPLOAD_MAX_BYTES_PER_CLAIM: String(1e15), UPLOAD_AGENCY_QUOTA_BYTES: String(1e15) } });
  let server: Server | null = null;
  try {
    server = await new Promise<Server>((resolve) => {
      const s = t.app.listen(0, '127.0.0.1', () => resolve(s));
    });
    const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    const signIn = await fetch(`${base}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', Origin: 'http://localhost:3000' },
      body: JSON.stringify({ email: 'tech@harborview.test', password: 'fieldproof-demo' }),
    });
    const cookie = signIn.headers.getSetCookie().find((c) => c.startsWith('fp_session='))!.split(';')[0];
    const claim = t.db.$client
      .prepare("select c.id from claims c join users u on u.id = c.technician_id where u.email = 'tech@harborview.test' and c.state = 'draft' order by c.number limit 1")
      .get() as { id: string };
    const blob = new Blob([new Uint8Array(jpeg)], { type: 'image/jpeg' });
    let done = 0;
    let failed = 0;
    const end = performance.now() + seconds * 1000;
    const start = performance.now();
    await Promise.all(
      Array.from({ length: concurrency }, async () => {
        while (performance.now() < end) {
          const form = new FormData();
          form.append('role', 'unit_overall');
          form.append('files', blob, 'bench.jpg');
          const res = await fetch(`${base}/api/claims/${claim.id}/attachments`, { method: 'POST', headers: { Cookie: cookie, Origin: 'http://localhost:3000' }, body: form });
          await res.arrayBuffer();
          if (res.status === 201) done++;
          else failed++;
        }
      }),
    );
    const elapsed = (performance.now() - start) / 1000;
    if (failed > 0) throw new Error(`${failed} uploads failed during the bench`);
    return {
      bytes: jpeg.length,
      megapixels: ((meta.width ?? 0) * (meta.height ?? 0)) / 1e6,
      runs,
      medianMs: median(totals),
      p90Ms: pct(totals, 0.9),
      minMs: Math.min(...totals),
      stagesMs: stages,
      uploads: done,
      seconds: elapsed,
      uploadsPerSecond: done / elapsed,
      concurrency,
    };
  } finally {
    await new Promise<void>((resolve) => (server ? server.close(() => resolve()) : resolve()));
    await t.close();
  }
}

/** For tests/bench/run.ts: add `photoIntake` to its list of measurements. */
export const photoIntake: Measurement = {
  name: 'photo intake (12-megapixel JPEG) and uploads at 4 concurrent clients',
  async run(ctx) {
    const r = await measurePhotoIntake({ seconds: Math.min(ctx.durationSeconds, 30), concurrency: 4 });
    const s = r.stagesMs;
    console.log(
      `  ${r.megapixels.toFixed(1)} MP, ${(r.bytes / 1e6).toFixed(1)} MB; stages (mean): type ${s.type.toFixed(1)} ms, hashes ${s.hashes.toFixed(1)} ms, EXIF ${s.exif.toFixed(1)} ms, thumbnail ${s.thumbnail.toFixed(1)} ms`,
    );
    const figures: Figure[] = [
      { label: 'intake of one 12 MP JPEG, median', value: `${r.medianMs.toFixed(0)} ms (p90 ${r.p90Ms.toFixed(0)} ms, min ${r.minMs.toFixed(0)} ms, ${r.runs} runs)` },
      { label: `uploads of that JPEG at ${r.concurrency} concurrent clients`, value: `${r.uploadsPerSecond.toFixed(2)} uploads/s (${r.uploads} in ${r.seconds.toFixed(1)} s)` },
    ];
    return figures;
  },
};

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const r = await measurePhotoIntake({ seconds: Number(process.env.BENCH_DURATION ?? 10) });
  console.log(JSON.stringify(r, null, 2));
}
