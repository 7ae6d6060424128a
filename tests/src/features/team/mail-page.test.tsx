import { screen, within } from '@testing-library/react';
import { beforeAll, describe, expect, it } from 'vitest';
import type { MailListResponse } from '../../../../shared/api/mail.ts';
import { stubApi } from '../../helpers/fake-api.ts';
import { me } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';

const list: MailListResponse = {
  items: [
    { id: '1764650001000-0a1b2c3e', to: 'oskar@harrowgate.test', subject: 'Review requested: Mill feeder', sentAt: '2026-12-02T05:01:00.000Z', delivered: false },
    { id: '1764650000000-0a1b2c3d', to: 'tamsin@harrowgate.test', subject: 'Ines Marlowe invites you to Harrowgate Works on Wyeward', sentAt: '2026-12-02T05:00:00.000Z', delivered: true },
  ],
};

beforeAll(async () => {
  await import('../../../../src/app/routes/team-mail.tsx');
});

describe('outgoing mail page', () => {
  it('says which messages the server has not been able to send yet', async () => {
    stubApi({
      'GET /api/auth/me': () => ({ body: me('owner') }),
      'GET /api/mail': () => ({ body: list }),
    });
    renderApp('/team/mail');
    const waiting = (await screen.findByText('Review requested: Mill feeder')).closest('li')!;
    expect(within(waiting).getByText('Not sent yet: the server keeps trying')).toBeInTheDocument();
    const sent = screen.getByText('Ines Marlowe invites you to Harrowgate Works on Wyeward').closest('li')!;
    expect(within(sent).queryByText(/Not sent yet/)).toBeNull();
  });
});
