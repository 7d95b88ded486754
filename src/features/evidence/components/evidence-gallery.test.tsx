import { describe, expect, it, beforeAll } from 'vitest';
import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { AttachmentView, EvidenceFlagView } from '@shared/schemas/evidence';
import { EvidenceGallery } from './evidence-gallery';

beforeAll(() => {
  // jsdom has <dialog> without showModal.
  HTMLDialogElement.prototype.showModal ??= function (this: HTMLDialogElement) {
    this.setAttribute('open', '');
  };
  HTMLDialogElement.prototype.close ??= function (this: HTMLDialogElement) {
    this.removeAttribute('open');
    this.dispatchEvent(new Event('close'));
  };
});

const base: AttachmentView = {
  id: 'a1',
  claimId: 'c1',
  role: 'failed_part',
  originalName: 'part.jpg',
  contentType: 'image/jpeg',
  kind: 'photo',
  sizeBytes: 12345,
  sha256: 'ab'.repeat(32),
  width: 1200,
  height: 900,
  takenAtRaw: '2026:03:09 23:30:00',
  takenAtOffset: '-08:00',
  takenAtUtc: '2026-03-10T07:30:00.000Z',
  gps: null,
  hasThumbnail: true,
  url: '/api/attachments/a1',
  thumbnailUrl: '/api/attachments/a1/thumbnail',
  previewUrl: '/api/attachments/a1/preview',
  uploadedBy: 'u1',
  uploadedByName: 'A technician',
  createdAt: '2026-03-12T10:00:00.000Z',
};

describe('EvidenceGallery', () => {
  it('shows thumbnails with their flags and opens the full image with the reasons', async () => {
    const heic: AttachmentView = { ...base, id: 'a2', originalName: 'IMG_1.HEIC', contentType: 'image/heic', hasThumbnail: false, url: '/api/attachments/a2', thumbnailUrl: '/api/attachments/a2/thumbnail', previewUrl: '/api/attachments/a2/preview' };
    const flags: EvidenceFlagView[] = [{ code: 'photo_outside_service_window', attachmentId: 'a1', message: 'Photo "part.jpg" (failed part) was taken 2026:03:09 23:30:00 (UTC-08:00), before the failure date 2026-03-10.' }];
    const user = userEvent.setup();
    render(<EvidenceGallery attachments={[base, heic]} flags={flags} />);
    const gallery = screen.getByRole('list', { name: 'Evidence gallery' });
    // Decorative thumbnails (alt=""): the button carries the name.
    const thumbs = [...gallery.querySelectorAll('img')];
    expect(thumbs.map((i) => i.getAttribute('src'))).toEqual(['/api/attachments/a1/thumbnail', '/api/attachments/a2/thumbnail']);
    expect(within(gallery).getByText('Photo taken outside the service window')).toBeInTheDocument();

    await user.click(screen.getByRole('button', { name: /^Open Failed part: part\.jpg/ }));
    const dialog = screen.getByRole('dialog');
    expect(within(dialog).getByRole('img', { name: /part\.jpg/ })).toHaveAttribute('src', '/api/attachments/a1/preview');
    expect(dialog).toHaveTextContent('2026-03-09 23:30:00 (UTC-08:00)');
    expect(dialog).toHaveTextContent('before the failure date 2026-03-10');
    await user.click(within(dialog).getByRole('button', { name: 'Close' }));
    expect(screen.queryByRole('dialog')).toBeNull();

    // A HEIC the browser cannot show opens its preview and a download instead.
    await user.click(screen.getByRole('button', { name: 'Open Failed part: IMG_1.HEIC' }));
    const d2 = screen.getByRole('dialog');
    expect(within(d2).getByRole('img', { name: /Preview of IMG_1\.HEIC/ })).toHaveAttribute('src', '/api/attachments/a2/thumbnail');
    expect(within(d2).getByRole('link', { name: 'Download the original' })).toHaveAttribute('href', '/api/attachments/a2');
  });
});
