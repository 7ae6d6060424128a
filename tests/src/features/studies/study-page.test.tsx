import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../../../shared/api/common.ts';
import type { CircuitEnvelope, StudyDetail } from '../../../../shared/api/studies.ts';
import { apiError, stubApi, type Handler } from '../../helpers/fake-api.ts';
import { me, studyDetail } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';

const circuit: CircuitEnvelope = {
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 60,
  elements: [
    { type: 'source', id: 'S', bus: 'Yard', kvLL: 0.208 },
    { type: 'load', id: 'L1', bus: 'Panel', connection: 'single', between: ['a', 'n'], ratedVolts: 120, each: { kw: 1, kvar: 0 } },
    { type: 'load', id: 'L2', bus: 'Panel', connection: 'single', between: ['b', 'n'], ratedVolts: 120, each: { kw: 1, kvar: 0 } },
  ],
};

function setup(role: Role, study: StudyDetail, patch?: Handler) {
  const api = stubApi({
    'GET /api/auth/me': () => ({ body: me(role) }),
    'GET /api/studies/:id': () => ({ body: study }),
    ...(patch ? { 'PATCH /api/studies/:id': patch } : {}),
    'GET /api/studies': () => ({ body: { items: [], total: 0, page: 1, pageSize: 20 } }),
  });
  return { api, ...renderApp(`/studies/${study.id}/details`) };
}

// The page is a lazy route: load its module once up front so each test measures behaviour, not the first import.
beforeAll(async () => {
  await import('../../../../src/app/routes/study.tsx');
});

describe('study page', () => {
  it('shows the record and the content summary of the circuit, with units', async () => {
    const s = studyDetail({
      name: 'Wrenfield service drop',
      version: 4,
      content: { circuit },
      createdBy: { id: 'u2', name: 'Oskar Penhale' },
      updatedBy: { id: 'u3', name: 'Dilys Arkwright' },
      clonedFrom: { id: '00000000-0000-4000-8000-00000000beef', name: 'Service drop template' },
    });
    setup('viewer', s);
    expect(await screen.findByRole('heading', { level: 1, name: 'Wrenfield service drop' })).toBeInTheDocument();
    expect(screen.getByText('Oskar Penhale')).toBeInTheDocument();
    expect(screen.getByText('Dilys Arkwright')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Service drop template' })).toHaveAttribute('href', '/studies/00000000-0000-4000-8000-00000000beef');

    const summary = screen.getByRole('region', { name: 'Circuit content' });
    expect(within(summary).getByText('60 Hz')).toBeInTheDocument();
    expect(within(summary).getByText('120 V, 208 V')).toBeInTheDocument();
    expect(within(summary).getByText('Panel · Yard')).toBeInTheDocument();
    const byType = within(summary).getByRole('table');
    expect(within(byType).getAllByRole('row').slice(1).map((r) => r.textContent)).toEqual(['load2', 'source1']);
    expect(within(summary).getByRole('link', { name: 'Open the diagram workspace' })).toHaveAttribute('href', `/studies/${s.id}`);
    // A viewer reads only.
    expect(screen.queryByRole('button', { name: 'Edit details' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Delete' })).not.toBeInTheDocument();
  });

  it('on a version conflict shows their version and lets the engineer reload theirs', async () => {
    const mine = studyDetail({ name: 'Hollin Cross feeder', description: 'First pass', version: 2, revision: 2 });
    const theirs: StudyDetail = { ...mine, name: 'Hollin Cross feeder (rev B)', description: 'Checked by Dilys', version: 3, revision: 3, updatedBy: { id: 'u3', name: 'Dilys Arkwright' } };
    const { api } = setup('engineer', mine, () =>
      ({ ...apiError(409, 'version-conflict', 'The study was changed by someone else.'), body: { error: { code: 'version-conflict', message: 'The study was changed by someone else.' }, current: theirs } }),
    );
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Edit details' }));
    const name = screen.getByLabelText('Name');
    await user.clear(name);
    await user.type(name, 'Hollin Cross feeder — my edit');
    await user.click(screen.getByRole('button', { name: 'Save changes' }));

    const alert = await screen.findByText(/Dilys Arkwright saved this study while you were editing/);
    expect(alert).toBeInTheDocument();
    expect(api.calls.find((c) => c.method === 'PATCH')?.body).toMatchObject({ version: 2, name: 'Hollin Cross feeder — my edit' });
    expect(screen.getByText('Nothing of yours was saved. Their version reads:')).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Save changes' })).toBeDisabled();
    // The record beside the form already shows the saved revision (the one number users read); the form still holds my text.
    const record = screen.getByRole('region', { name: 'Record' });
    expect(within(record).getByText('3')).toBeInTheDocument();
    expect(document.body.textContent).not.toMatch(/\bv\d/);
    expect(within(record).getByText('Dilys Arkwright')).toBeInTheDocument();
    expect(screen.getByLabelText('Name')).toHaveValue('Hollin Cross feeder — my edit');

    await user.click(screen.getByRole('button', { name: 'Reload theirs (discard my changes)' }));
    expect(screen.getByLabelText('Name')).toHaveValue('Hollin Cross feeder (rev B)');
    expect(screen.getByLabelText('Description')).toHaveValue('Checked by Dilys');
    expect(screen.getByText('revision 3', { selector: 'span.num' })).toBeInTheDocument();
  });

  it('keeping my edits after a conflict saves against their version, and says so first', async () => {
    const mine = studyDetail({ name: 'Sallow Bank', version: 5, updatedAt: '2026-11-02T09:00:00.000Z' });
    const theirs: StudyDetail = { ...mine, name: 'Sallow Bank (theirs)', version: 6, updatedAt: '2026-11-02T10:30:00.000Z', updatedBy: { id: 'u3', name: 'Dilys Arkwright' } };
    let patches = 0;
    const { api } = setup('owner', mine, (req) => {
      patches += 1;
      if (patches === 1) return { status: 409, body: { error: { code: 'version-conflict', message: 'Stale version' }, current: theirs } };
      const body = req.body as { version: number; name: string };
      return { body: { ...theirs, name: body.name, version: body.version + 1 } };
    });
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Edit details' }));
    await user.clear(screen.getByLabelText('Name'));
    await user.type(screen.getByLabelText('Name'), 'Sallow Bank (mine)');
    await user.click(screen.getByRole('button', { name: 'Save changes' }));
    await user.click(await screen.findByRole('button', { name: 'Keep editing mine' }));

    expect(screen.getByText(/^Saving now replaces what Dilys Arkwright saved at .+\.$/)).toBeInTheDocument();
    expect(screen.getByLabelText('Name')).toHaveValue('Sallow Bank (mine)');
    await user.click(screen.getByRole('button', { name: 'Save changes' }));

    await waitFor(() => expect(screen.getByRole('heading', { level: 1 })).toHaveTextContent('Sallow Bank (mine)'));
    const sent = api.calls.filter((c) => c.method === 'PATCH').map((c) => (c.body as { version: number }).version);
    expect(sent).toEqual([5, 6]);
  });

  it('offers the Template box only on an approved study (or a template), and says why not on a draft', async () => {
    setup('engineer', studyDetail({ name: 'Draft feeder', status: 'draft' }), () => ({ body: {} }));
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Edit details' }));
    expect(screen.queryByRole('checkbox', { name: /Template/ })).not.toBeInTheDocument();
    expect(screen.getByText(/only an approved study can become a template; this one is a draft/)).toBeInTheDocument();
  });

  it('offers the Template box on an approved study', async () => {
    setup('engineer', studyDetail({ name: 'Approved feeder', status: 'approved' }), () => ({ body: {} }));
    const user = userEvent.setup();
    await user.click(await screen.findByRole('button', { name: 'Edit details' }));
    expect(screen.getByRole('checkbox', { name: /Template/ })).not.toBeChecked();
  });

  it('says a missing study is not found (another team’s study is a 404 too)', async () => {
    stubApi({
      'GET /api/auth/me': () => ({ body: me('owner') }),
      'GET /api/studies/:id': () => apiError(404, 'not-found', 'Study not found'),
    });
    renderApp('/studies/00000000-0000-4000-8000-000000000404/details');
    expect(await screen.findByText('Study not found.')).toBeInTheDocument();
  });
});
