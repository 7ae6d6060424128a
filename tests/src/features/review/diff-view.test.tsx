import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import type { RevisionDiff } from '../../../../shared/api/revisions.ts';
import { stubApi } from '../../helpers/fake-api.ts';
import { me, studyDetail } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';
import { revision, STUDY_ID } from './review-fixtures.ts';

// Values are invented for the display test; the diff itself is computed by shared/review/diff.ts (tested there).
function diff(from: number, to: number): RevisionDiff {
  return {
    from,
    to,
    elements: {
      added: [{ id: 'LOAD-7', type: 'load', typeLabel: 'load' }, { id: 'SW-2', type: 'switch3', typeLabel: 'switch' }],
      removed: [],
      changed: [
        {
          id: 'DROP',
          type: 'line',
          typeLabel: 'line',
          changes: [
            { path: 'open', from: null, to: ['n'], label: 'open conductors', fromText: '—', toText: 'neutral' },
            { path: 'length', from: 30, to: 45, label: 'length', fromText: '30', toText: '45' },
          ],
        },
      ],
    },
    circuit: [{ path: 'frequencyHz', from: 60, to: 50, label: 'frequency (Hz)', fromText: '60', toText: '50' }],
    cases: [{ caseId: 'lost-n', kind: 'change-added', text: 'case "Neutral lost": DROP open n added' }],
    layoutChanged: true,
    settingsChanged: false,
    results: [
      { kind: 'neutral-current', key: 'DROP@HOUSE', label: 'HOUSE (DROP)', unit: 'A', from: 12.1, to: 83.3, delta: 71.2, text: 'neutral current at HOUSE (DROP): 12.1 A → 83.3 A' },
      { kind: 'bus-voltage', key: 'HOUSE.b', label: 'HOUSE phase b', unit: 'V', from: 120.4, to: 131.2, delta: 10.8, text: 'voltage at HOUSE phase b: 120.4 V → 131.2 V' },
    ],
    flags: {
      added: [{ key: 'overvoltage|HOUSE||b', severity: 'violation', code: 'overvoltage' as never, bus: 'HOUSE', conductor: 'b', value: 131.2, limit: 127, unit: 'V', message: 'phase b 131 V above Range B', text: 'flag added: phase b 131 V above Range B' }],
      removed: [],
    },
    solve: { from: 'ok', to: 'ok' },
  };
}

describe('diff view', () => {
  it('defaults to the latest revision against the previous and shows result deltas with units, flags and parameter changes', async () => {
    const api = stubApi({
      'GET /api/auth/me': () => ({ body: me('reviewer') }),
      'GET /api/studies/:id': () => ({ body: studyDetail({ id: STUDY_ID, name: 'Tallow Lane drop' }) }),
      'GET /api/studies/:id/revisions': () => ({ body: { items: [revision(3), revision(2), revision(1)] } }),
      'GET /api/studies/:id/diff': (req) => ({ body: diff(Number(req.url.searchParams.get('from')), Number(req.url.searchParams.get('to'))) }),
    });
    renderApp(`/studies/${STUDY_ID}/diff`);
    const region = await screen.findByRole('region', { name: 'Changes from revision 2 to revision 3' });
    const diffCall = api.calls.find((c) => c.url.pathname.endsWith('/diff'))!;
    expect(diffCall.url.searchParams.get('from')).toBe('2');
    expect(diffCall.url.searchParams.get('to')).toBe('3');

    const rows = within(within(region).getByRole('table', { name: 'Result changes' })).getAllByRole('row');
    expect(rows.slice(1).map((r) => r.textContent)).toEqual([
      'neutral current at HOUSE (DROP): 12.1 A → 83.3 ANeutral current+71.20 A',
      'voltage at HOUSE phase b: 120.4 V → 131.2 VBus voltage+10.80 V',
    ]);
    expect(within(region).getByRole('list', { name: 'Flag changes' })).toHaveTextContent('flag added: phase b 131 V above Range B');

    const drop = within(region).getByRole('table', { name: 'Changes to DROP' });
    const dropRows = within(drop).getAllByRole('row').slice(1).map((r) => r.textContent);
    expect(dropRows).toEqual(['open conductors—neutral', 'length3045']);
    // Element kinds in words, never the engine's type names.
    expect(region).toHaveTextContent('Added: LOAD-7 (load), SW-2 (switch)');
    expect(region).not.toHaveTextContent('switch3');
    expect(within(region).getByRole('table', { name: 'Circuit changes' })).toHaveTextContent('frequency (Hz)6050');
    expect(region).toHaveTextContent('The diagram layout changed.');
    expect(within(region).getByRole('list', { name: 'Study case changes' })).toHaveTextContent('case "Neutral lost": DROP open n added');
    // Results are shown, so the caution is beside them.
    expect(region).toHaveTextContent('licensed practice');
  });

  it('compares the revisions chosen in the selects', async () => {
    const api = stubApi({
      'GET /api/auth/me': () => ({ body: me('viewer') }),
      'GET /api/studies/:id': () => ({ body: studyDetail({ id: STUDY_ID }) }),
      'GET /api/studies/:id/revisions': () => ({ body: { items: [revision(3), revision(2), revision(1)] } }),
      'GET /api/studies/:id/diff': (req) => ({ body: diff(Number(req.url.searchParams.get('from')), Number(req.url.searchParams.get('to'))) }),
    });
    const user = userEvent.setup();
    renderApp(`/studies/${STUDY_ID}/diff`);
    await screen.findByRole('region', { name: 'Changes from revision 2 to revision 3' });
    await user.selectOptions(screen.getByLabelText('From revision'), '1');
    expect(await screen.findByRole('region', { name: 'Changes from revision 1 to revision 3' })).toBeInTheDocument();
    await waitFor(() => expect(api.calls.some((c) => c.url.pathname.endsWith('/diff') && c.url.searchParams.get('from') === '1' && c.url.searchParams.get('to') === '3')).toBe(true));
  });

  it('says so when a side does not solve', async () => {
    stubApi({
      'GET /api/auth/me': () => ({ body: me('viewer') }),
      'GET /api/studies/:id': () => ({ body: studyDetail({ id: STUDY_ID }) }),
      'GET /api/studies/:id/revisions': () => ({ body: { items: [revision(2), revision(1)] } }),
      'GET /api/studies/:id/diff': () => ({ body: { ...diff(1, 2), results: [], flags: { added: [], removed: [] }, solve: { from: 'ok', to: 'error', toError: 'Bus HOUSE is floating' } } }),
    });
    renderApp(`/studies/${STUDY_ID}/diff?from=1&to=2`);
    const region = await screen.findByRole('region', { name: 'Changes from revision 1 to revision 2' });
    expect(region).toHaveTextContent('Revision 2 does not solve: Bus HOUSE is floating');
    expect(region).toHaveTextContent('No key result changed');
  });

  describe('an address the revisions do not fit', () => {
    function stub() {
      return stubApi({
        'GET /api/auth/me': () => ({ body: me('viewer') }),
        'GET /api/studies/:id': () => ({ body: studyDetail({ id: STUDY_ID }) }),
        'GET /api/studies/:id/revisions': () => ({ body: { items: [revision(5), revision(4), revision(3), revision(2), revision(1)] } }),
        'GET /api/studies/:id/diff': (req) => ({ body: diff(Number(req.url.searchParams.get('from')), Number(req.url.searchParams.get('to'))) }),
      });
    }
    const diffCalls = (api: ReturnType<typeof stubApi>) => api.calls.filter((c) => c.url.pathname.endsWith('/diff')).map((c) => `${c.url.searchParams.get('from')}→${c.url.searchParams.get('to')}`);

    it('from newer than to: compares older → newer, the selects show the same, and the page says it turned them round', async () => {
      const api = stub();
      const { router } = renderApp(`/studies/${STUDY_ID}/diff?from=5&to=1`);
      expect(await screen.findByRole('region', { name: 'Changes from revision 1 to revision 5' })).toBeInTheDocument();
      expect(screen.getByLabelText('From revision')).toHaveValue('1');
      expect(screen.getByLabelText('To revision')).toHaveValue('5');
      expect(screen.getByRole('status')).toHaveTextContent('Revision 5 is newer than revision 1, so the changes are shown from revision 1 to revision 5.');
      expect(diffCalls(api)).toEqual(['1→5']);
      expect(router.state.location.search).toBe('?from=1&to=5');
    });

    it('a revision that does not exist: a clear message, no comparison, and selects that show no other revision as chosen', async () => {
      const api = stub();
      // The history arrives after the page's first render and effects: 9 > 2 must not be turned round before it is known that 9 does not exist.
      const answer = globalThis.fetch;
      vi.stubGlobal('fetch', async (input: RequestInfo | URL, init?: RequestInit) => {
        if (String(input).includes('/revisions')) await new Promise((r) => setTimeout(r, 50));
        return answer(input, init);
      });
      renderApp(`/studies/${STUDY_ID}/diff?from=9&to=2`);
      expect(await screen.findByRole('alert')).toHaveTextContent('This study has no revision 9: its revisions are 1 to 5. Choose the two to compare.');
      const from = screen.getByLabelText('From revision') as HTMLSelectElement;
      expect(from.value).toBe('');
      expect(from.selectedOptions[0].textContent).toBe('Choose a revision');
      expect(screen.getByLabelText('To revision')).toHaveValue('2');
      expect(screen.queryByRole('region', { name: /Changes from revision/ })).not.toBeInTheDocument();
      expect(diffCalls(api)).toEqual([]);
    });
  });
});
