import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Role } from '../../../../shared/api/common.ts';
import { AttachmentsPanel } from '../../../../src/features/review/components/attachments-panel.tsx';
import { apiError, stubApi, type Handler } from '../../helpers/fake-api.ts';
import { REVIEWER, SELF, STUDY_ID } from './review-fixtures.ts';
import { renderReview } from './render-review.tsx';

function setup(role: Role, upload?: Handler) {
  const api = stubApi({
    'GET /api/studies/:id/attachments': () => ({
      body: { items: [{ id: 'a1', fileName: 'tallow-lane-survey.pdf', contentType: 'application/pdf', size: 312_000, uploadedBy: REVIEWER, createdAt: '2026-11-02T12:00:00.000Z' }] },
    }),
    ...(upload ? { 'POST /api/studies/:id/attachments': upload } : {}),
  });
  renderReview(<AttachmentsPanel studyId={STUDY_ID} role={role} userId={SELF.id} />);
  return api;
}

const pdf = () => new File(['%PDF-1.7 survey'], 'survey.pdf', { type: 'application/pdf' });

describe('attachments', () => {
  it('lists files with a download link and size', async () => {
    setup('viewer');
    const link = await screen.findByRole('link', { name: 'tallow-lane-survey.pdf' });
    expect(link).toHaveAttribute('href', `/api/studies/${STUDY_ID}/attachments/a1`);
    expect(screen.getByRole('list', { name: 'Attached files' })).toHaveTextContent('304.7 KB');
    // A viewer neither uploads nor deletes.
    expect(screen.queryByLabelText('Attach a file')).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Delete/ })).not.toBeInTheDocument();
  });

  it('shows the 413 answer in plain words with the limit', async () => {
    setup('reviewer', () => apiError(413, 'payload-too-large', 'Files are limited to 10 MB.'));
    const user = userEvent.setup();
    await user.upload(await screen.findByLabelText('Attach a file'), pdf());
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('The file was not attached.');
    expect(alert).toHaveTextContent('The file is too large: at most 10 MB. Files are limited to 10 MB.');
  });

  it('shows the 415 answer with the accepted types', async () => {
    setup('reviewer', () => apiError(415, 'unsupported-media-type', 'The content of survey.pdf is not a PDF.'));
    const user = userEvent.setup();
    await user.upload(await screen.findByLabelText('Attach a file'), pdf());
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('upload a PDF, PNG, JPEG or CSV whose content matches its name');
    expect(alert).toHaveTextContent('The content of survey.pdf is not a PDF.');
  });

  it('refuses a file over 10 MB before sending it', async () => {
    const api = setup('reviewer', () => ({ status: 201, body: {} }));
    const user = userEvent.setup();
    const big = new File([new Uint8Array(10 * 1024 * 1024 + 1)], 'big.pdf', { type: 'application/pdf' });
    await user.upload(await screen.findByLabelText('Attach a file'), big);
    expect(await screen.findByRole('alert')).toHaveTextContent('The file is too large: 10.0 MB, at most 10 MB.');
    expect(api.calls.filter((c) => c.method === 'POST')).toHaveLength(0);
  });

  it('uploads the file as multipart and refreshes the list', async () => {
    const api = setup('reviewer', () => ({ status: 201, body: { id: 'a2', fileName: 'survey.pdf', contentType: 'application/pdf', size: 15, uploadedBy: SELF, createdAt: '2026-11-03T12:00:00.000Z' } }));
    const user = userEvent.setup();
    await user.upload(await screen.findByLabelText('Attach a file'), pdf());
    await waitFor(() => expect(api.calls.filter((c) => c.method === 'GET' && c.url.pathname.endsWith('/attachments'))).toHaveLength(2));
    const post = api.fetch.mock.calls.find(([, init]) => init?.method === 'POST');
    expect(post?.[1]?.body).toBeInstanceOf(FormData);
    expect(((post?.[1]?.body as FormData).get('file') as File).name).toBe('survey.pdf');
    expect(screen.queryByRole('alert')).not.toBeInTheDocument();
    expect(within(screen.getByRole('list', { name: 'Attached files' })).getAllByRole('listitem')).toHaveLength(1);
  });
});
