import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Role } from '../../../../shared/api/common.ts';
import type { StudySummary } from '../../../../shared/api/studies.ts';
import { stubApi, type FakeRequest } from '../../helpers/fake-api.ts';
import { me, study } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';

const STUDIES: StudySummary[] = [
  study({ name: 'Brindle Lane open neutral', updatedAt: '2026-11-25T10:00:00.000Z', elementCount: 9 }),
  study({ name: 'Apsley feeder unbalance', updatedAt: '2026-11-20T10:00:00.000Z', elementCount: 14, status: 'approved' }),
  study({ name: 'Corve substation delta–wye bank', updatedAt: '2026-11-10T10:00:00.000Z', elementCount: 6, isTemplate: true }),
];

/** Answers GET /api/studies the way the contract describes: q filters names, template filters, sort/dir order, pages. */
function listStudies(req: FakeRequest) {
  const p = req.url.searchParams;
  const q = (p.get('q') ?? '').toLowerCase();
  let items = STUDIES.filter((s) => s.name.toLowerCase().includes(q));
  if (p.get('template') === 'true') items = items.filter((s) => s.isTemplate);
  const sort = p.get('sort') ?? 'updatedAt';
  const dir = p.get('dir') === 'asc' ? 1 : -1;
  items = [...items].sort((a, b) => dir * (sort === 'name' ? a.name.localeCompare(b.name) : a.updatedAt.localeCompare(b.updatedAt)));
  return { body: { items, total: items.length, page: Number(p.get('page') ?? 1), pageSize: Number(p.get('pageSize') ?? 20) } };
}

function setup(role: Role) {
  const api = stubApi({
    'GET /api/auth/me': () => ({ body: me(role) }),
    'GET /api/studies': listStudies,
  });
  return { api, ...renderApp('/') };
}

/** Study names in table order. */
function rowNames(): string[] {
  const table = screen.getByRole('table');
  return within(table)
    .getAllByRole('row')
    .slice(1)
    .map((row) => within(row).getAllByRole('cell')[0].textContent ?? '');
}

describe('studies list', () => {
  it('lists studies newest first and marks the template with a worded badge', async () => {
    setup('engineer');
    await screen.findByRole('link', { name: 'Apsley feeder unbalance' });
    expect(rowNames()).toEqual(['Brindle Lane open neutral', 'Apsley feeder unbalance', 'Corve substation delta–wye bank']);
    const templateRow = screen.getByRole('link', { name: 'Corve substation delta–wye bank' }).closest('tr')!;
    expect(within(templateRow).getByText('Template')).toBeInTheDocument();
    expect(within(templateRow).getByRole('button', { name: 'Start from template Corve substation delta–wye bank' })).toBeInTheDocument();
    const plainRow = screen.getByRole('link', { name: 'Apsley feeder unbalance' }).closest('tr')!;
    expect(within(plainRow).queryByText('Template')).not.toBeInTheDocument();
    expect(within(plainRow).getByText('Approved')).toBeInTheDocument();
    expect(within(plainRow).getByRole('button', { name: 'Clone Apsley feeder unbalance' })).toBeInTheDocument();
  });

  it('states a template’s violations before "Start from template" copies them', async () => {
    const risky = study({
      id: 'tpl-risky',
      name: 'Brackenfield open neutral',
      isTemplate: true,
      status: 'approved',
      risk: { revision: 2, solved: true, violationCount: 3, warningCount: 0, worst: 'bus HOUSE c-n: 167.3 V = 1.394 pu is above the violation limit', error: null },
    });
    const posted: string[] = [];
    stubApi({
      'GET /api/auth/me': () => ({ body: me('engineer') }),
      'GET /api/studies': () => ({ body: { items: [risky], total: 1, page: 1, pageSize: 20 } }),
      'POST /api/studies/:id/clone': (req) => {
        posted.push(req.url.pathname);
        return { status: 201, body: { id: 'copy-1', version: 1 } };
      },
      'GET /api/studies/:id': () => ({ body: { ...risky, id: 'copy-1', content: { circuit: { format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: [] } }, clonedFrom: null } }),
    });
    const user = userEvent.setup();
    renderApp('/');
    await user.click(await screen.findByRole('button', { name: 'Start from template Brackenfield open neutral' }));
    const dialog = await screen.findByRole('dialog', { name: 'Start from “Brackenfield open neutral”?' });
    expect(dialog).toHaveTextContent('Revision 2 has 3 violations.');
    expect(dialog).toHaveTextContent('The worst: bus HOUSE c-n: 167.3 V');
    expect(dialog).toHaveTextContent('licensed practice');
    expect(posted).toEqual([]);
    await user.click(within(dialog).getByRole('button', { name: 'Start a new study anyway' }));
    await waitFor(() => expect(posted).toEqual(['/api/studies/tpl-risky/clone']));
  });

  it('sorts by name through the server when the Name header is used, and flips on a second press', async () => {
    const { api } = setup('viewer');
    await screen.findByRole('link', { name: 'Apsley feeder unbalance' });
    expect(rowNames()[0]).toBe('Brindle Lane open neutral');
    expect(screen.getByRole('columnheader', { name: /Updated at/ })).toHaveAttribute('aria-sort', 'descending');
    const user = userEvent.setup();

    await user.click(screen.getByRole('button', { name: 'Name' }));
    await waitFor(() => expect(rowNames()[0]).toBe('Apsley feeder unbalance'));
    expect(rowNames()).toEqual(['Apsley feeder unbalance', 'Brindle Lane open neutral', 'Corve substation delta–wye bank']);
    expect(screen.getByRole('columnheader', { name: /Name/ })).toHaveAttribute('aria-sort', 'ascending');
    expect(screen.getByRole('columnheader', { name: /Updated at/ })).toHaveAttribute('aria-sort', 'none');
    expect(api.calls.at(-1)?.url.searchParams.get('sort')).toBe('name');
    expect(api.calls.at(-1)?.url.searchParams.get('dir')).toBe('asc');

    await user.click(screen.getByRole('button', { name: 'Name' }));
    await waitFor(() => expect(rowNames()[0]).toBe('Corve substation delta–wye bank'));
    expect(rowNames()).toEqual(['Corve substation delta–wye bank', 'Brindle Lane open neutral', 'Apsley feeder unbalance']);
    expect(screen.getByRole('columnheader', { name: /Name/ })).toHaveAttribute('aria-sort', 'descending');
    expect(api.calls.at(-1)?.url.searchParams.get('dir')).toBe('desc');
  });

  it('filters by name with ?q= and by the Templates only toggle', async () => {
    const { api, router } = setup('viewer');
    await screen.findByRole('link', { name: 'Apsley feeder unbalance' });
    const user = userEvent.setup();

    await user.type(screen.getByRole('searchbox', { name: 'Filter studies by name' }), 'neutral');
    await waitFor(() => expect(rowNames()).toEqual(['Brindle Lane open neutral']));
    expect(router.state.location.search).toBe('?q=neutral');
    await waitFor(() => expect(api.calls.at(-1)?.url.searchParams.get('q')).toBe('neutral'));
    // The filter waits for a pause in typing rather than asking once per keystroke.
    expect(api.calls.filter((c) => c.url.pathname === '/api/studies').length).toBeLessThan(5);

    await user.clear(screen.getByRole('searchbox', { name: 'Filter studies by name' }));
    await user.click(screen.getByRole('checkbox', { name: 'Templates only' }));
    await waitFor(() => expect(rowNames()).toEqual(['Corve substation delta–wye bank']));
    expect(router.state.location.search).toBe('?template=true');
  });

  it('offers New study, clone and delete to an engineer', async () => {
    setup('engineer');
    await screen.findByRole('link', { name: 'Apsley feeder unbalance' });
    expect(screen.getByRole('button', { name: 'New study' })).toBeInTheDocument();
    expect(screen.getAllByRole('button', { name: /^Delete / })).toHaveLength(3);
  });

  it('asks before deleting: Escape cancels and returns focus, confirming sends the DELETE and refreshes the list', async () => {
    let deleted: string | null = null;
    const api = stubApi({
      'GET /api/auth/me': () => ({ body: me('engineer') }),
      'GET /api/studies': listStudies,
      'DELETE /api/studies/:id': (req) => {
        deleted = req.url.pathname.split('/').at(-1) ?? null;
        return { status: 204 };
      },
    });
    renderApp('/');
    const user = userEvent.setup();
    const target = STUDIES[0];
    const deleteButton = await screen.findByRole('button', { name: `Delete ${target.name}` });

    await user.click(deleteButton);
    expect(screen.getByRole('dialog', { name: 'Delete this study?' })).toHaveTextContent(target.name);
    await user.keyboard('{Escape}');
    expect(screen.queryByRole('dialog')).not.toBeInTheDocument();
    expect(deleteButton).toHaveFocus();
    expect(deleted).toBeNull();

    const listCalls = () => api.calls.filter((c) => c.method === 'GET' && c.url.pathname === '/api/studies').length;
    const before = listCalls();
    await user.click(deleteButton);
    await user.click(within(screen.getByRole('dialog')).getByRole('button', { name: 'Delete study' }));
    await waitFor(() => expect(screen.queryByRole('dialog')).not.toBeInTheDocument());
    expect(deleted).toBe(target.id);
    await waitFor(() => expect(listCalls()).toBeGreaterThan(before));
  });

  it.each(['viewer', 'reviewer'] as const)('hides New study, clone and delete from a %s', async (role) => {
    setup(role);
    await screen.findByRole('link', { name: 'Apsley feeder unbalance' });
    expect(screen.getByText(new RegExp(`^${role}$`, 'i'))).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'New study' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /^Clone / })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /^Start from template/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /^Delete / })).not.toBeInTheDocument();
    // The template is still recognisable to them.
    const templateRow = screen.getByRole('link', { name: 'Corve substation delta–wye bank' }).closest('tr')!;
    expect(within(templateRow).getByText('Template')).toBeInTheDocument();
  });
});

describe('studies list paging', () => {
  it('shows the total and page count and asks the server for the next page', async () => {
    const api = stubApi({
      'GET /api/auth/me': () => ({ body: me('viewer') }),
      'GET /api/studies': (req) => {
        const page = Number(req.url.searchParams.get('page') ?? 1);
        return { body: { items: [study({ name: `Page ${page} study` })], total: 45, page, pageSize: 20 } };
      },
    });
    const user = userEvent.setup();
    renderApp('/');
    await screen.findByRole('link', { name: 'Page 1 study' });
    const pager = screen.getByRole('navigation', { name: 'Pages of studies' });
    expect(pager).toHaveTextContent('45 studies · page 1 of 3');
    expect(within(pager).getByRole('button', { name: '← Previous page' })).toBeDisabled();

    await user.click(within(pager).getByRole('button', { name: 'Next page →' }));
    await screen.findByRole('link', { name: 'Page 2 study' });
    expect(api.calls.at(-1)?.url.searchParams.get('page')).toBe('2');
    expect(screen.getByRole('navigation', { name: 'Pages of studies' })).toHaveTextContent('page 2 of 3');
  });
});

describe('studies list past the last page', () => {
  it('says so and offers the first page instead of claiming there are no studies', async () => {
    stubApi({
      'GET /api/auth/me': () => ({ body: me('viewer') }),
      'GET /api/studies': (req) => {
        const page = Number(req.url.searchParams.get('page') ?? 1);
        return { body: { items: page === 1 ? [study({ name: 'Only study' })] : [], total: 1, page, pageSize: 20 } };
      },
    });
    const user = userEvent.setup();
    const { router } = renderApp('/?page=7');
    expect(await screen.findByText(/is past the end of the list/)).toBeInTheDocument();
    expect(screen.queryByText('No studies yet.')).not.toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Go to the first page' }));
    expect(await screen.findByRole('link', { name: 'Only study' })).toBeInTheDocument();
    expect(router.state.location.search).toBe('');
  });
});
