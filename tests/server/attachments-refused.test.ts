import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import sharp from 'sharp';
import { makeTestApp, type TestApp } from '../factories/test-app';
import { editableClaimOf, snapshot } from '../fixtures/evidence-app';
import { multipartBody, type RawPart } from '../fixtures/multipart';
import { scenePhoto, pngScene, simplePdf } from '../fixtures/photos';
import { flushAuditRepeats } from '../../server/lib/audit';

// Every refused upload (OWASP ASVS 5.0 5.2.x file upload, 5.3.x storage; OWASP File Upload
// Cheat Sheet): a clear 4xx, and nothing left behind — the rows and the files on disk are
// counted before and after each attempt.

const ORIGIN = 'http://localhost:3000';
type Agent = Awaited<ReturnType<TestApp['signIn']>>;

const HTML = '<!DOCTYPE html><html><body><script>alert(document.cookie)</script></body></html>';
const SVG = '<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><script>alert(1)</script></svg>';
/** The start of a Windows PE executable: "MZ", the DOS stub, and a PE header offset. */
function executable(): Buffer {
  const b = Buffer.alloc(512);
  b.write('MZ', 0, 'latin1');
  b.writeUInt32LE(0x80, 0x3c);
  b.write('PE\0\0', 0x80, 'latin1');
  b.write('This program cannot be run in DOS mode.', 0x4e, 'latin1');
  return b;
}

/** A JPEG with HTML hidden in a comment segment (COM, 0xFFFE) right after the start of image. */
async function jpegWithScriptComment(): Promise<Buffer> {
  const jpeg = await scenePhoto(301, { width: 200, height: 150 });
  const payload = Buffer.from(`<html><script>alert(1)</script></html>`, 'latin1');
  const seg = Buffer.alloc(4);
  seg.writeUInt16BE(0xfffe, 0);
  seg.writeUInt16BE(payload.length + 2, 2);
  return Buffer.concat([jpeg.subarray(0, 2), seg, payload, jpeg.subarray(2)]);
}

describe('refused uploads leave nothing behind', () => {
  let t: TestApp;
  let tech: Agent;
  let url: string;

  beforeAll(async () => {
    t = await makeTestApp();
    tech = await t.signIn('techA');
    url = `/api/claims/${editableClaimOf(t, 'tech@harborview.test').id}/attachments`;
  });
  afterAll(async () => {
    await t.close();
  });

  async function refused(send: () => Promise<request.Response>, status: number, message: RegExp) {
    const before = snapshot(t);
    const res = await send();
    expect(res.status).toBe(status);
    expect(res.body.error.message).toMatch(message);
    expect(snapshot(t)).toEqual(before);
    return res;
  }
  const one = (data: Buffer | string, filename: string, contentType?: string) => () =>
    tech.post(url).set('Origin', ORIGIN).attach('files', Buffer.isBuffer(data) ? data : Buffer.from(data), contentType ? { filename, contentType } : filename);
  const raw = (parts: RawPart[]) => () => {
    const { body, contentType } = multipartBody(parts);
    return tech.post(url).set('Origin', ORIGIN).set('Content-Type', contentType).send(body);
  };

  it('HTML renamed .jpg: 415', async () => {
    await refused(one(HTML, 'photo.jpg', 'image/jpeg'), 415, /named as a JPEG photo, but its content is not a recognised binary format/);
  });

  it('SVG (with a script) renamed .jpg: 415', async () => {
    await refused(one(SVG, 'plate.jpg', 'image/jpeg'), 415, /named as a JPEG photo, but its content is application\/xml/);
  });

  it('SVG without an XML declaration renamed .png: 415', async () => {
    await refused(one('<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>', 'plate.png'), 415, /not a recognised binary format/);
  });

  it('a polyglot JPEG with HTML in a comment segment: 415', async () => {
    const poly = await jpegWithScriptComment();
    // It still decodes as an image: only the markup check stops it.
    expect((await sharp(poly).metadata()).format).toBe('jpeg');
    await refused(one(poly, 'poly.jpg'), 415, /HTML or script in its metadata/);
  });

  it('a polyglot JPEG with HTML appended after the image: 415', async () => {
    const poly = Buffer.concat([await scenePhoto(302, { width: 200, height: 150 }), Buffer.from(HTML)]);
    await refused(one(poly, 'poly2.jpg'), 415, /appended after the image/);
  });

  it('a JPEG with a ZIP archive appended (photo and archive at once): 415', async () => {
    const zipHead = Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0, 0]), Buffer.alloc(40)]);
    await refused(one(Buffer.concat([await scenePhoto(303, { width: 200, height: 150 }), zipHead]), 'poly3.jpg'), 415, /archive appended/);
  });

  it('a PNG with a script in a text chunk: 415', async () => {
    const png = await pngScene(304);
    const text = Buffer.from('Comment\0<script>alert(1)</script>', 'latin1');
    const chunk = Buffer.alloc(12 + text.length);
    chunk.writeUInt32BE(text.length, 0);
    chunk.write('tEXt', 4, 'latin1');
    text.copy(chunk, 8);
    // CRC is not checked by the markup scan; the chunk goes before IEND.
    const iend = png.length - 12;
    await refused(one(Buffer.concat([png.subarray(0, iend), chunk, png.subarray(iend)]), 'poly.png'), 415, /HTML or script in a text chunk/);
  });

  it('a PDF that is also an HTML page, and a PDF with JavaScript: 415', async () => {
    const html = Buffer.concat([simplePdf(), Buffer.from(HTML)]);
    await refused(one(html, 'invoice.pdf'), 415, /PDF also contains HTML/);
    const js = Buffer.from(simplePdf().toString('latin1').replace('<< /Type /Catalog', '<< /OpenAction << /S /JavaScript /JS (app.alert(1)) >> /Type /Catalog'), 'latin1');
    await refused(one(js, 'invoice2.pdf'), 415, /scripts, launch actions or embedded files/);
  });

  it('an executable, renamed .jpg or with its own .exe name: 415', async () => {
    await refused(one(executable(), 'setup.jpg', 'image/jpeg'), 415, /content is application\/x-msdownload/);
    await refused(one(executable(), 'setup.exe'), 415, /not accepted/);
  });

  it('a PNG named .jpg (extension and content disagree): 415', async () => {
    await refused(one(await pngScene(305), 'photo.jpg'), 415, /content is a PNG image/);
  });

  it('a damaged JPEG (truncated in the middle of the image data): 415', async () => {
    const jpeg = await scenePhoto(306);
    await refused(one(jpeg.subarray(0, Math.floor(jpeg.length / 2)), 'half.jpg'), 415, /could not be read|truncated/);
  });

  it('zero bytes: 400', async () => {
    await refused(one(Buffer.alloc(0), 'empty.jpg'), 400, /empty \(0 bytes\)/);
  });

  it('a CSV that is not UTF-8, one with unbalanced quotes, and one with ragged rows: 415', async () => {
    await refused(one(Buffer.from('key,phase,value,unit\r\ntemp\xe9,after,350,F\r\n', 'latin1'), 'r.csv'), 415, /not valid UTF-8/);
    await refused(one('key,phase,value,unit\r\n"oil_temp,after,350,F\r\n', 'r2.csv'), 415, /not a well-formed CSV/);
    await refused(one('key,phase,value,unit\r\noil_temp,after\r\n', 'r3.csv'), 415, /not a well-formed CSV/);
    await refused(one(`a,b\r\n${HTML},x\r\n`, 'r4.csv'), 415, /CSV contains HTML/);
  });

  it('a name with ../ (path traversal), with a backslash path, or only dots: 400', async () => {
    const jpeg = await scenePhoto(307, { width: 100, height: 80 });
    await refused(raw([{ name: 'files', filenameHeader: 'filename="../../etc/evil.jpg"', contentType: 'image/jpeg', data: jpeg }]), 400, /may not contain a path/);
    await refused(raw([{ name: 'files', filenameHeader: 'filename="..\\\\..\\\\evil.jpg"', contentType: 'image/jpeg', data: jpeg }]), 400, /may not contain a path/);
    await refused(raw([{ name: 'files', filenameHeader: "filename*=UTF-8''..%2F..%2Fevil.jpg", contentType: 'image/jpeg', data: jpeg }]), 400, /may not contain a path/);
  });

  it('a name with a NUL byte: 400', async () => {
    const jpeg = await scenePhoto(308, { width: 100, height: 80 });
    // A raw NUL inside the part header: the header cannot be parsed, refused as malformed.
    await refused(raw([{ name: 'files', filenameHeader: 'filename="photo.php\0.jpg"', contentType: 'image/jpeg', data: jpeg }]), 400, /NUL/);
    await refused(raw([{ name: 'files', filenameHeader: "filename*=UTF-8''photo.php%00.jpg", contentType: 'image/jpeg', data: jpeg }]), 400, /NUL/);
  });

  it('a name with CR/LF (header injection): 400', async () => {
    const jpeg = await scenePhoto(309, { width: 100, height: 80 });
    // Browsers escape CR and LF in names as %0D %0A (WHATWG); multer turns them back.
    await refused(raw([{ name: 'files', filenameHeader: 'filename="a%0D%0AContent-Type: text/html.jpg"', contentType: 'image/jpeg', data: jpeg }]), 400, /line break/);
    await refused(raw([{ name: 'files', filenameHeader: "filename*=UTF-8''a%0D%0Ab.jpg", contentType: 'image/jpeg', data: jpeg }]), 400, /line break/);
    // A raw CR LF inside the header line breaks the part's headers: refused as malformed.
    const r = await refused(raw([{ name: 'files', filenameHeader: 'filename="a\r\nX-Evil: 1.jpg"', contentType: 'image/jpeg', data: jpeg }]), 400, /.+/);
    expect(r.body.error.code).not.toBe('internal_error');
  });

  it('a spoofed Content-Type: HTML sent as image/jpeg with a .jpg name: 415', async () => {
    await refused(raw([{ name: 'files', filenameHeader: 'filename="cat.jpg"', contentType: 'image/jpeg', data: HTML }]), 415, /not a recognised binary format/);
  });

  it('a file field other than "files", and no file at all: 400', async () => {
    const jpeg = await scenePhoto(310, { width: 100, height: 80 });
    await refused(() => tech.post(url).set('Origin', ORIGIN).attach('upload', jpeg, 'a.jpg'), 400, /field "files"/);
    await refused(() => tech.post(url).set('Origin', ORIGIN).field('role', 'other'), 400, /at least one file/);
    await refused(() => tech.post(url).set('Origin', ORIGIN).send({ files: [] }), 415, /multipart/);
  });

  it('an unknown role, or a role count that does not match the files: 400', async () => {
    const jpeg = await scenePhoto(311, { width: 100, height: 80 });
    await refused(() => tech.post(url).set('Origin', ORIGIN).field('role', 'selfie').attach('files', jpeg, 'a.jpg'), 400, /need attention/);
    await refused(
      () => tech.post(url).set('Origin', ORIGIN).field('roles', 'other').field('roles', 'invoice').field('roles', 'other').attach('files', jpeg, 'a.jpg').attach('files', jpeg, 'b.jpg'),
      400,
      /one role per file/,
    );
  });

  it('one refused file refuses the whole request: the good file beside it is not stored either', async () => {
    const good = await scenePhoto(312, { width: 100, height: 80 });
    await refused(() => tech.post(url).set('Origin', ORIGIN).attach('files', good, 'good.jpg').attach('files', Buffer.from(HTML), 'bad.jpg'), 415, /bad\.jpg/);
  });

  it('the default size limit (15 MB) + 1 byte: 413', async () => {
    const big = Buffer.alloc(15 * 1024 * 1024 + 1, 0);
    (await scenePhoto(313, { width: 100, height: 80 })).copy(big);
    await refused(one(big, 'huge.jpg'), 413, /at most 15 MB/);
  });

  it('the default count limit (10 per request) + 1: 413', async () => {
    const jpeg = await scenePhoto(314, { width: 60, height: 40 });
    await refused(() => {
      let r = tech.post(url).set('Origin', ORIGIN);
      for (let i = 0; i < 11; i++) r = r.attach('files', jpeg, `p${i}.jpg`);
      return r;
    }, 413, /At most 10 files/);
  });
});

describe('limits at their exact boundaries', () => {
  let t: TestApp;
  let tech: Agent;
  let jpeg: Buffer;

  beforeAll(async () => {
    jpeg = await scenePhoto(401, { width: 160, height: 120 });
    t = await makeTestApp({
      env: {
        UPLOAD_MAX_FILE_BYTES: String(jpeg.length),
        UPLOAD_MAX_FILES_PER_REQUEST: '3',
        UPLOAD_MAX_FILES_PER_CLAIM: '4',
        UPLOAD_MAX_BYTES_PER_CLAIM: String(jpeg.length * 100),
        UPLOAD_AGENCY_QUOTA_BYTES: String(jpeg.length * 6),
      },
    });
    tech = await t.signIn('techA');
  });
  afterAll(async () => {
    await t.close();
  });

  it('a file of exactly the size limit is accepted; one byte more is refused with 413', async () => {
    const url = `/api/claims/${editableClaimOf(t, 'tech@harborview.test').id}/attachments`;
    const ok = await tech.post(url).set('Origin', ORIGIN).attach('files', jpeg, 'exact.jpg');
    expect(ok.status).toBe(201);
    const before = snapshot(t);
    const over = await tech.post(url).set('Origin', ORIGIN).attach('files', Buffer.concat([jpeg, Buffer.from([0])]), 'over.jpg');
    expect(over.status).toBe(413);
    expect(snapshot(t)).toEqual(before);
  });

  it('exactly the count limit is accepted; one more is refused', async () => {
    const url = `/api/claims/${editableClaimOf(t, 'tech@harborview.test', { skip: 1 }).id}/attachments`;
    const three = await tech.post(url).set('Origin', ORIGIN).attach('files', jpeg, 'a.jpg').attach('files', jpeg, 'b.jpg').attach('files', jpeg, 'c.jpg');
    expect(three.status).toBe(201);
    const before = snapshot(t);
    const four = await tech.post(url).set('Origin', ORIGIN).attach('files', jpeg, 'a.jpg').attach('files', jpeg, 'b.jpg').attach('files', jpeg, 'c.jpg').attach('files', jpeg, 'd.jpg');
    expect(four.status).toBe(413);
    expect(four.body.error.message).toMatch(/At most 3 files/);
    expect(snapshot(t)).toEqual(before);
  });

  it('the files-per-claim limit counts what the claim already has', async () => {
    const url = `/api/claims/${editableClaimOf(t, 'tech@harborview.test', { skip: 1 }).id}/attachments`;
    const fourth = await tech.post(url).set('Origin', ORIGIN).attach('files', jpeg, 'd.jpg');
    expect(fourth.status).toBe(201);
    const before = snapshot(t);
    const fifth = await tech.post(url).set('Origin', ORIGIN).attach('files', jpeg, 'e.jpg');
    expect(fifth.status).toBe(413);
    expect(fifth.body.error.message).toMatch(/at most 4 files; this one has 4/);
    expect(snapshot(t)).toEqual(before);
  });

  it("the agency's quota counts every claim of the agency", async () => {
    const url = `/api/claims/${editableClaimOf(t, 'tech@harborview.test', { withUnit: false, skip: 1 }).id}/attachments`;
    // 5 stored so far; the quota holds 6.
    expect((await tech.post(url).set('Origin', ORIGIN).attach('files', jpeg, 'f.jpg')).status).toBe(201);
    const before = snapshot(t);
    const over = await tech.post(url).set('Origin', ORIGIN).attach('files', jpeg, 'g.jpg');
    expect(over.status).toBe(413);
    expect(over.body.error.message).toMatch(/storage quota/);
    expect(snapshot(t)).toEqual(before);
    // The other agency has its own quota.
    const techB = await t.signIn('techB');
    const urlB = `/api/claims/${editableClaimOf(t, 'tech@prairieline.test').id}/attachments`;
    expect((await techB.post(urlB).set('Origin', ORIGIN).attach('files', jpeg, 'h.jpg')).status).toBe(201);
  });

  it('refusals are audited as failures with their reason', async () => {
    // Identical refusals within a minute are one row plus a summary row with the count of repeats.
    flushAuditRepeats(t.db, t.deps.clock, true);
    const rows = t.db.$client.prepare("select outcome, detail from audit_log where action = 'attachment.upload' and outcome != 'success'").all() as Array<{ outcome: string; detail: string }>;
    const refusals = rows.reduce((n, r) => n + (JSON.parse(r.detail).repeats ?? 1), 0);
    expect(refusals).toBeGreaterThanOrEqual(4);
    expect(rows.every((r) => r.outcome === 'failure')).toBe(true);
    expect(rows.some((r) => JSON.parse(r.detail).code === 'too_large')).toBe(true);
  });
});
