import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { AttachmentView } from '@shared/schemas/evidence';
import { installFakeFetch, json } from '@/testing/fake-fetch';
import { renderWithRouter } from '@/testing/render';
import { EvidenceGallery } from './evidence-gallery';

const photo: AttachmentView = {
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
  takenAtRaw: null,
  takenAtOffset: null,
  takenAtUtc: null,
  gps: null,
  hasThumbnail: true,
  url: '/api/attachments/a1',
  thumbnailUrl: '/api/attachments/a1/thumbnail',
  previewUrl: '/api/attachments/a1/preview',
  uploadedBy: 'u1',
  uploadedByName: 'A technician',
  createdAt: '2026-03-12T10:00:00.000Z',
  retractedAt: null,
  retractionReason: null,
};

describe('evidence gallery: relabel, remove, retract', () => {
  it('relabels and removes a file while the claim is editable', async () => {
    const fetch = installFakeFetch((c) => {
      if (c.method === 'PATCH' && c.url.pathname === '/api/attachments/a1') return json({ ...photo, role: 'serial_plate' });
      if (c.method === 'DELETE' && c.url.pathname === '/api/attachments/a1') return new Response(null, { status: 204 });
      return undefined;
    });
    try {
      const user = userEvent.setup();
      renderWithRouter(<EvidenceGallery attachments={[photo]} flags={[]} claimId="c1" manage="edit" />);
      await user.selectOptions(screen.getByLabelText('What part.jpg shows'), 'serial_plate');
      await waitFor(() => expect(fetch.calls.some((c) => c.method === 'PATCH')).toBe(true));
      expect(fetch.calls.find((c) => c.method === 'PATCH')!.body).toEqual({ role: 'serial_plate' });
      await user.click(screen.getByRole('button', { name: 'Remove part.jpg' }));
      await waitFor(() => expect(fetch.calls.some((c) => c.method === 'DELETE')).toBe(true));
    } finally {
      fetch.restore();
    }
  });

  it('retracts a file of a filed claim only with a reason', async () => {
    const fetch = installFakeFetch((c) => {
      if (c.method === 'POST' && c.url.pathname === '/api/attachments/a1/retraction') return json({ ...photo, retractedAt: '2026-03-13T10:00:00.000Z', retractionReason: (c.body as { reason: string }).reason });
      return undefined;
    });
    try {
      const user = userEvent.setup();
      renderWithRouter(<EvidenceGallery attachments={[photo]} flags={[]} claimId="c1" manage="retract" />);
      expect(screen.queryByRole('button', { name: 'Remove part.jpg' })).toBeNull();
      await user.click(screen.getByRole('button', { name: 'Retract part.jpg' }));
      await user.click(screen.getByRole('button', { name: 'Retract' }));
      expect(screen.getByText(/say why the file is retracted/i)).toBeInTheDocument();
      expect(fetch.calls).toHaveLength(0);
      await user.type(screen.getByLabelText('Why retract part.jpg?'), 'Photo of another unit.');
      await user.click(screen.getByRole('button', { name: 'Retract' }));
      await waitFor(() => expect(fetch.calls).toHaveLength(1));
      expect(fetch.calls[0]!.body).toEqual({ reason: 'Photo of another unit.' });
    } finally {
      fetch.restore();
    }
  });

  it('shows the reviewer a retracted file with the agency’s reason', () => {
    renderWithRouter(<EvidenceGallery attachments={[{ ...photo, retractedAt: '2026-03-13T10:00:00.000Z', retractionReason: 'Photo of another unit.' }]} flags={[]} />);
    expect(screen.getByText('Retracted by the agency:')).toBeInTheDocument();
    expect(screen.getByText(/Photo of another unit\./)).toBeInTheDocument();
  });
});
