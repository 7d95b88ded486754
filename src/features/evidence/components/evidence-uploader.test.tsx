import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { act, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { renderWithRouter } from '@/testing/render';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { EvidenceUploader } from './evidence-uploader';

/** A stand-in for XMLHttpRequest: records each send and lets the test drive progress and the answer. */
class FakeXhr {
  static sent: FakeXhr[] = [];
  method = '';
  url = '';
  status = 0;
  responseText = '';
  responseType = '';
  withCredentials = false;
  body: FormData | null = null;
  upload: { onprogress: ((e: { lengthComputable: boolean; loaded: number; total: number }) => void) | null } = { onprogress: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onabort: (() => void) | null = null;
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader() {}
  abort() {
    this.onabort?.();
  }
  send(body: FormData) {
    this.body = body;
    FakeXhr.sent.push(this);
  }
  progress(loaded: number, total: number) {
    this.upload.onprogress?.({ lengthComputable: true, loaded, total });
  }
  answer(status: number, body: unknown) {
    this.status = status;
    this.responseText = JSON.stringify(body);
    this.onload?.();
  }
  fail() {
    this.onerror?.();
  }
}

const original = globalThis.XMLHttpRequest;
let net: ReturnType<typeof installFakeFetch>;

beforeEach(() => {
  FakeXhr.sent = [];
  globalThis.XMLHttpRequest = FakeXhr as unknown as typeof XMLHttpRequest;
  net = installFakeFetch((c) => (c.url.pathname.endsWith('/attachments') ? json({ attachments: [], flags: [], limits: {}, usage: { files: 0, bytes: 0 } }) : undefined));
});
afterEach(() => {
  globalThis.XMLHttpRequest = original;
  net.restore();
});

const photo = (name = 'plate.jpg') => new File([new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 1, 2, 3])], name, { type: 'image/jpeg' });

describe('EvidenceUploader', () => {
  it('uploads each file with its role, shows the progress, and retries a failed upload', async () => {
    const user = userEvent.setup();
    renderWithRouter(<EvidenceUploader claimId="claim-1" />);
    await user.selectOptions(screen.getByLabelText('What are you adding?'), 'serial_plate');
    await user.upload(screen.getByTestId('evidence-input'), [photo()]);

    await waitFor(() => expect(FakeXhr.sent).toHaveLength(1));
    const first = FakeXhr.sent[0];
    expect(first.method).toBe('POST');
    expect(first.url).toBe('/api/claims/claim-1/attachments');
    expect(first.body!.get('role')).toBe('serial_plate');
    expect((first.body!.get('files') as File).name).toBe('plate.jpg');

    act(() => first.progress(40, 100));
    const bar = await screen.findByRole('progressbar', { name: 'Upload of plate.jpg' });
    await waitFor(() => expect(bar).toHaveAttribute('aria-valuenow', '40'));

    act(() => first.fail());
    expect(await screen.findByText(/upload was interrupted/)).toBeInTheDocument();
    const row = screen.getByTestId('upload-row');
    // The role can be corrected before trying again.
    await user.selectOptions(within(row).getByLabelText('Role'), 'failed_part');
    await user.click(within(row).getByRole('button', { name: 'Retry' }));

    await waitFor(() => expect(FakeXhr.sent).toHaveLength(2));
    expect(FakeXhr.sent[1].body!.get('role')).toBe('failed_part');
    act(() => FakeXhr.sent[1].progress(100, 100));
    act(() => FakeXhr.sent[1].answer(201, { attachments: [{ id: 'a1' }], flags: [{ code: 'photo_reused', message: 'Photo "plate.jpg" is the same file as a photo on claim X.' }] }));
    expect(await within(row).findByText('Uploaded')).toBeInTheDocument();
    expect(within(row).getByText(/same file as a photo on claim X/)).toBeInTheDocument();
    expect(bar).toHaveAttribute('aria-valuenow', '100');
  });

  it('sends several files, each in its own request with its own bar', async () => {
    const user = userEvent.setup();
    renderWithRouter(<EvidenceUploader claimId="claim-1" />);
    await user.upload(screen.getByTestId('evidence-input'), [photo('a.jpg'), photo('b.jpg'), photo('c.jpg')]);
    expect(await screen.findAllByRole('progressbar')).toHaveLength(3);
    // Two at a time; the third waits for a free slot.
    await waitFor(() => expect(FakeXhr.sent).toHaveLength(2));
    act(() => FakeXhr.sent[0].answer(201, { attachments: [], flags: [] }));
    await waitFor(() => expect(FakeXhr.sent).toHaveLength(3));
    expect(FakeXhr.sent.map((x) => (x.body!.get('files') as File).name)).toEqual(['a.jpg', 'b.jpg', 'c.jpg']);
  });

  it('imports a CSV as a readings sheet and lists each bad row with its line', async () => {
    const user = userEvent.setup();
    renderWithRouter(<EvidenceUploader claimId="claim-1" />);
    await user.upload(screen.getByTestId('evidence-input'), [new File(['key,phase,value,unit\n'], 'sheet.csv', { type: 'text/csv' })]);
    await waitFor(() => expect(FakeXhr.sent).toHaveLength(1));
    expect(FakeXhr.sent[0].url).toBe('/api/claims/claim-1/readings/import');
    act(() => FakeXhr.sent[0].answer(400, {
      error: { code: 'csv_invalid', message: 'The readings sheet has 2 problems; nothing was imported.' },
      errors: [
        { line: 3, message: 'Unknown reading key "flux".' },
        { line: 5, message: 'The value "warm" is not a number.' },
      ],
    }));
    const list = await screen.findByRole('list', { name: 'Problems in sheet.csv' });
    expect(within(list).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['Line 3: Unknown reading key "flux".', 'Line 5: The value "warm" is not a number.']);
    expect(screen.getByText(/nothing was imported/)).toBeInTheDocument();
  });

  it('offers the phone camera: an image input with capture', () => {
    renderWithRouter(<EvidenceUploader claimId="claim-1" />);
    const cam = screen.getByTestId('camera-input');
    expect(cam).toHaveAttribute('accept', 'image/*');
    expect(cam).toHaveAttribute('capture', 'environment');
    expect(screen.getByRole('button', { name: /Take a photo/ })).toBeInTheDocument();
  });
});
