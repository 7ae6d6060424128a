/**
 * The balancing page's weighted mix: the objective choice offers it with four labelled weight boxes,
 * the request carries the weights typed (an empty box weighs nothing), and bad weights are form
 * errors in words that send nothing to the server.
 */
import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { beforeAll, describe, expect, it } from 'vitest';
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
