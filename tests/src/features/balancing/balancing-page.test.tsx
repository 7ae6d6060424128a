/**
 * The balancing page's weighted mix: the objective choice offers it with four labelled weight boxes,
 * the request carries the weights typed (an empty box weighs nothing), and bad weights are form
 * errors in words that send nothing to the server. While the server works, the page asks for the
 * streamed mode and shows each progress line in words beside Cancel (in a live region), and an error
 * that arrives after streaming began; the server's stream is stood in for at the fetch boundary.
 */
import { fireEvent, screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { apiError, stubApi } from '../../helpers/fake-api.ts';
import { me, studyDetail } from '../../helpers/fixtures.ts';
import { renderApp } from '../../helpers/render-app.tsx';

function setup() {
  const s = studyDetail({ name: 'Lane houses' });
  const api = stubApi({
    'GET /api/auth/me': () => ({ body: me('engineer') }),
    'GET /api/studies/:id': () => ({ body: s }),
    'POST /api/studies/:id/balance': () => apiError(400, 'validation', 'The study cannot be balanced: it has no single-phase kW loads between a phase and the neutral.'),
  });
  renderApp(`/studies/${s.id}/balance`);
  return api;
}
const posts = (api: ReturnType<typeof stubApi>) => api.calls.filter((c) => c.method === 'POST');

beforeAll(async () => {
  await import('../../../../src/app/routes/study-balance.tsx');
});

describe('balancing page: weighted mix', () => {
  it('offers the weighted mix with four labelled weights and sends the weights typed', async () => {
    const user = userEvent.setup();
    const api = setup();
    const objective = await screen.findByLabelText('Objective');
    expect(document.title).toBe('Phase balancing — Lane houses — Wyeward');
    expect(screen.queryByLabelText('Weight of the losses')).not.toBeInTheDocument();
    await user.selectOptions(objective, 'Weighted mix');
    for (const label of ['Weight of the neutral current', 'Weight of the voltage unbalance', 'Weight of the losses', 'Weight of the lowest customer voltage']) {
      expect(screen.getByLabelText(label)).toHaveValue('1');
    }
    await user.clear(screen.getByLabelText('Weight of the losses'));
    await user.type(screen.getByLabelText('Weight of the losses'), '2.5');
    await user.clear(screen.getByLabelText('Weight of the lowest customer voltage'));
    await user.selectOptions(screen.getByLabelText('Unbalance definition'), 'ieee');
    await user.click(screen.getByRole('button', { name: 'Run balancing' }));
    expect(await screen.findByText(/no single-phase kW loads/)).toBeInTheDocument();
    expect(posts(api)).toHaveLength(1);
    expect(posts(api)[0].body).toEqual({ objective: 'mix', definition: 'ieee', weights: { neutral: 1, unbalance: 1, losses: 2.5 }, maxMoves: 8 });
  });

  it('says in words what is wrong with the weights and sends nothing', async () => {
    const user = userEvent.setup();
    const api = setup();
    await user.selectOptions(await screen.findByLabelText('Objective'), 'Weighted mix');
    const run = screen.getByRole('button', { name: 'Run balancing' });
    await user.clear(screen.getByLabelText('Weight of the neutral current'));
    await user.type(screen.getByLabelText('Weight of the neutral current'), '-1');
    await user.click(run);
    expect(screen.getByRole('alert')).toHaveTextContent('The neutral current weight cannot be negative.');
    await user.clear(screen.getByLabelText('Weight of the neutral current'));
    await user.type(screen.getByLabelText('Weight of the neutral current'), 'lots');
    await user.click(run);
    expect(screen.getByRole('alert')).toHaveTextContent('The neutral current weight must be a number (found "lots").');
    for (const label of ['Weight of the neutral current', 'Weight of the voltage unbalance', 'Weight of the losses']) await user.clear(screen.getByLabelText(label));
    await user.clear(screen.getByLabelText('Weight of the lowest customer voltage'));
    await user.type(screen.getByLabelText('Weight of the lowest customer voltage'), '0');
    await user.click(run);
    expect(screen.getByRole('alert')).toHaveTextContent('Give the weighted mix at least one weight above zero.');
    expect(posts(api)).toHaveLength(0);
  });
});

function setupStream() {
  const s = studyDetail({ name: 'Lane houses' });
  const api = stubApi({
    'GET /api/auth/me': () => ({ body: me('engineer') }),
    'GET /api/studies/:id': () => ({ body: s }),
  });
  let push!: (text: string) => void;
  let close!: () => void;
  const stream = new ReadableStream<Uint8Array>({
    start(c) {
      const bytes = new TextEncoder();
      push = (text) => c.enqueue(bytes.encode(text));
      close = () => c.close();
    },
  });
  const balanceCalls: RequestInit[] = [];
  vi.stubGlobal('fetch', async (input: RequestInfo | URL, init?: RequestInit) => {
    if (init?.method === 'POST' && String(input).endsWith('/balance')) {
      balanceCalls.push(init);
      return new Response(stream, { status: 200, headers: { 'Content-Type': 'application/x-ndjson; charset=utf-8' } });
    }
    return api.fetch(input, init);
  });
  renderApp(`/studies/${s.id}/balance`);
  return { push: (t: string) => push(t), close: () => close(), balanceCalls };
}

describe('balancing page: progress while running', () => {
  it('shows each progress line in words beside Cancel, then an error that came after streaming began', async () => {
    const user = userEvent.setup();
    const server = setupStream();
    await user.click(await screen.findByRole('button', { name: 'Run balancing' }));
    expect(await screen.findByRole('button', { name: 'Cancel' })).toBeInTheDocument();
    expect(new Headers(server.balanceCalls[0].headers).get('Accept')).toContain('application/x-ndjson');
    // one line split across two chunks
    server.push('{"progress":{"stage":"linear');
    server.push('ising","solves":12}}\n');
    const status = await screen.findByText('Finding the best moves: linearising the feeder — 12 exact solves so far');
    expect(status).toHaveAttribute('aria-live', 'polite');
    expect(status).toHaveAttribute('role', 'status');
    server.push('{"progress":{"stage":"milp","solves":13}}\n{"progress":{"stage":"local-search","solves":1}}\n');
    expect(await screen.findByText('Finding the best moves: checking moves with exact solves — 1 exact solve so far')).toBeInTheDocument();
    server.push('{"error":{"code":"unavailable","message":"The balancing was cancelled."}}\n');
    server.close();
    expect(await screen.findByText('The balancing was cancelled.')).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Cancel' })).not.toBeInTheDocument();
    expect(screen.queryByText(/exact solves? so far/)).not.toBeInTheDocument();
  });
});

describe('balancing page: an answer belongs to the customers it was run on', () => {
  it('puts away the server\'s error when another customer list is chosen or the form is corrected', async () => {
    const user = userEvent.setup();
    const api = setup();
    await user.click(await screen.findByLabelText(/A customer list \(CSV/));
    const file = (name: string, text: string) => new File([text], name, { type: 'text/csv' });
    await user.upload(screen.getByLabelText('Customer list (CSV)'), file('first.csv', 'customer,bus,phase,kw,kvar\nH1,P1,A,2,0\n'));
    expect(await screen.findByText('first.csv: 1 customer read.')).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Run balancing' }));
    expect(await screen.findByText(/no single-phase kW loads/)).toBeInTheDocument();
    // a corrected file: the earlier answer is about the earlier file
    await user.upload(screen.getByLabelText('Customer list (CSV)'), file('second.csv', 'customer,bus,phase,kw,kvar\nH1,P1,Q,2,0\n'));
    expect(await screen.findByText('second.csv has problems')).toBeInTheDocument();
    expect(screen.queryByText(/no single-phase kW loads/)).not.toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Run balancing' }));
    expect(screen.getByText(/Correct the customer list first/)).toBeInTheDocument();
    expect(screen.queryByText(/no single-phase kW loads/)).not.toBeInTheDocument();
    expect(posts(api)).toHaveLength(1);
  });
});

describe('balancing page: choosing the same file again', () => {
  it('empties the file box when it is clicked, so the same file, edited, is read again (a browser reports only a changed choice)', async () => {
    const user = userEvent.setup();
    setup();
    await user.click(await screen.findByLabelText(/A customer list \(CSV/));
    const input = screen.getByLabelText('Customer list (CSV)') as HTMLInputElement;
    await user.upload(input, new File(['customer,bus,phase,kw,kvar\nH1,P1,A,2,0\n'], 'lane.csv', { type: 'text/csv' }));
    expect(await screen.findByText('lane.csv: 1 customer read.')).toBeInTheDocument();
    expect(input.files).toHaveLength(1);
    // Opening the file chooser again: the box forgets its choice, so picking lane.csv again is a change.
    fireEvent.click(input);
    expect(input.files).toHaveLength(0);
    expect(input.value).toBe('');
    // What was read stays until another file is chosen.
    expect(screen.getByText('lane.csv: 1 customer read.')).toBeInTheDocument();
    await user.upload(input, new File(['customer,bus,phase,kw,kvar\nH1,P1,A,2,0\nH2,P1,B,1,0\n'], 'lane.csv', { type: 'text/csv' }));
    expect(await screen.findByText('lane.csv: 2 customers read.')).toBeInTheDocument();
  });
});

describe('balancing page: applying an uploaded customer list', () => {
  it('says in the revision message that the list\'s customers were added as loads, not only the moves', async () => {
    const user = userEvent.setup();
    const s = studyDetail({ name: 'Lane feeder' });
    const figures = { neutralCurrentA: 10, maxUnbalancePercent: { iec: 1, nema: 1, ieee: 1 }, lossesKw: 1, minCustomerVoltagePu: 0.95, maxCustomerVoltagePu: 1 };
    const cx = { re: 1, im: 0 };
    const currents = { a: cx, b: cx, c: cx, n: cx };
    const voltage = (phase: string) => [{ customer: 'H1', bus: 'P1', phase, volts: 230, pu: 1 }];
    const api = stubApi({
      'GET /api/auth/me': () => ({ body: me('engineer') }),
      'GET /api/studies/:id': () => ({ body: s }),
      'POST /api/studies/:id/balance': () => ({
        body: {
          objective: 'neutral current leaving bus P0',
          assignment: { H1: 'B', H2: 'A' },
          moves: [{ customer: 'H1', bus: 'P1', from: 'A', to: 'B' }],
          before: figures,
          after: figures,
          rotatingRule: figures,
          gapPercent: 0,
          milpStatus: 'optimal',
          solves: 4,
          maxMoves: 8,
          voltages: { before: voltage('A'), after: voltage('B') },
          currents: { at: 'P0', before: currents, after: currents },
          fromStudy: false,
          caution: 'CAUTION: phase moves are work on live equipment.',
        },
      }),
      'PATCH /api/studies/:id': (req) => ({ body: { ...s, version: 2, revision: 2, content: (req.body as { content: unknown }).content } }),
    });
    renderApp(`/studies/${s.id}/balance`);
    await user.click(await screen.findByLabelText(/A customer list \(CSV/));
    await user.upload(screen.getByLabelText('Customer list (CSV)'), new File(['customer,bus,phase,kw,kvar\nH1,P1,A,2,0\nH2,P1,A,1,0\n'], 'lane.csv', { type: 'text/csv' }));
    await screen.findByText('lane.csv: 2 customers read.');
    await user.click(screen.getByRole('button', { name: 'Run balancing' }));
    await user.click(await screen.findByRole('button', { name: 'Apply as a new revision' }));
    expect(await screen.findByText(/Saved as revision 2/)).toBeInTheDocument();
    const patch = api.calls.find((c) => c.method === 'PATCH')!;
    expect((patch.body as { message: string }).message).toBe('Phase balancing: 2 customers added as loads from lane.csv, 1 move (neutral current leaving bus P0)');
  });
});
