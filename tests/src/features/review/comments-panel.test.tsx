import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import type { Role } from '../../../../shared/api/common.ts';
import type { Comment } from '../../../../shared/api/comments.ts';
import { CommentsPanel, type ResultRowChoice } from '../../../../src/features/review/components/comments-panel.tsx';
import { stubApi, type Handler } from '../../helpers/fake-api.ts';
import { comment, ENGINEER, REVIEWER, SELF, STUDY_ID, team } from './review-fixtures.ts';
import { renderReview } from './render-review.tsx';

function setup(role: Role, items: Comment[], handlers: Record<string, Handler> = {}, resultRows: ResultRowChoice[] = [], circuit?: unknown) {
  const api = stubApi({
    'GET /api/studies/:id/comments': () => ({ body: { items } }),
    'GET /api/team': () => ({ body: team() }),
    ...handlers,
  });
  renderReview(<CommentsPanel studyId={STUDY_ID} role={role} userId={SELF.id} elementIds={['SRC', 'DROP', 'LOAD-A']} resultRows={resultRows} circuit={circuit} />);
  return api;
}

/** A circuit where LOAD-A's neutral was opened with one click: a hidden switch and a private terminal bus. */
const OPENED = {
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 60,
  elements: [
    { type: 'load', id: 'LOAD-A', bus: 'LOAD-A~bus', connection: 'single', between: ['a', 'n'], each: { kw: 1 } },
    { type: 'switch3', id: 'LOAD-A~bus~sw', from: 'HOUSE', to: 'LOAD-A~bus', conductors: ['a', 'b', 'c', 'n'], open: ['n'] },
  ],
};

describe('comments', () => {
  it('renders a <script> body as text, keeps line breaks, and shows the anchor', async () => {
    const hostile = '<script>window.__pwned = 1</script>\n<img src=x onerror="alert(1)">\nsecond line';
    setup('reviewer', [comment({ body: hostile, anchor: { elementId: 'DROP' } })]);
    const thread = await screen.findByRole('listitem', { name: /Thread by Dilys Arkwright, Element DROP/ });
    const body = within(thread).getByText((_, el) => el?.tagName === 'P' && el.textContent === hostile);
    expect(body).toHaveClass('whitespace-pre-wrap');
    expect(thread.querySelector('script')).toBeNull();
    expect(thread.querySelector('img')).toBeNull();
    expect((window as unknown as { __pwned?: number }).__pwned).toBeUndefined();
    expect(within(thread).getByText('Element DROP')).toBeInTheDocument();
  });

  it('names threads on an opened connection and on its private terminal bus as the user drew them, never with internal names', async () => {
    setup(
      'viewer',
      [
        comment({ id: 'p1', body: 'Why is this open?', anchor: { elementId: 'LOAD-A~bus~sw' } }),
        comment({ id: 'p2', body: 'Terminal voltage?', anchor: { resultRow: { table: 'bus-voltages', key: 'LOAD-A~bus' } } }),
        comment({ id: 'p3', body: 'Current?', anchor: { resultRow: { table: 'neutral-currents', key: 'LOAD-A@LOAD-A~bus' } } }),
      ],
      {},
      [],
      OPENED,
    );
    const list = await screen.findByRole('list', { name: 'Comment threads' });
    expect(within(list).getByRole('listitem', { name: /Connection LOAD-A–HOUSE/ })).toBeInTheDocument();
    expect(within(list).getByRole('listitem', { name: /Bus voltages at LOAD-A terminals at HOUSE/ })).toBeInTheDocument();
    expect(within(list).getByRole('listitem', { name: /Neutral current of LOAD-A at HOUSE/ })).toBeInTheDocument();
    expect(list.textContent).not.toMatch(/~/);
  });

  it('groups replies under their thread, marks resolved threads, and shows deleted comments as such', async () => {
    setup('viewer', [
      comment({ id: 'r1', body: 'Neutral current looks high at the house.', anchor: { resultRow: { table: 'neutral-currents', key: 'DROP@HOUSE' } } }),
      comment({ id: 'r2', parentId: 'r1', author: ENGINEER, body: 'Fixed in revision 3.' }),
      comment({ id: 'r3', body: '', deleted: true, resolved: true, resolvedBy: REVIEWER }),
    ]);
    const threads = await screen.findAllByRole('listitem');
    expect(threads).toHaveLength(2);
    expect(threads[0]).toHaveAccessibleName('Thread by Dilys Arkwright, Neutral current of DROP at HOUSE');
    expect(within(threads[0]).getByRole('article', { name: 'Comment by Oskar Penhale' })).toHaveTextContent('Fixed in revision 3.');
    expect(threads[1]).toHaveTextContent('Resolved by Dilys Arkwright');
    expect(threads[1]).toHaveTextContent('Comment deleted.');
    // Viewers read only.
    expect(screen.queryByRole('form', { name: 'New comment' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Reply|Resolve|Edit|Delete/ })).not.toBeInTheDocument();
  });

  it('posts a comment pinned to the chosen element and names who will be notified', async () => {
    const posted: unknown[] = [];
    setup('reviewer', [], {
      'POST /api/studies/:id/comments': (req) => {
        posted.push(req.body);
        return { status: 201, body: comment({ body: String((req.body as { body: string }).body) }) };
      },
    });
    const user = userEvent.setup();
    const form = await screen.findByRole('form', { name: 'New comment' });
    await user.type(within(form).getByLabelText('New comment'), '@oskar the neutral is open here');
    expect(await within(form).findByText('Will notify: Oskar Penhale')).toBeInTheDocument();
    await user.selectOptions(within(form).getByLabelText('Pin to an element or result'), 'DROP');
    await user.click(within(form).getByRole('button', { name: 'Post comment' }));
    await waitFor(() => expect(posted).toEqual([{ body: '@oskar the neutral is open here', anchor: { elementId: 'DROP' } }]));
  });

  it('offers edit on own comments only, and resolve on threads to reviewers', async () => {
    const patched: unknown[] = [];
    setup('reviewer', [comment({ id: 'mine', author: SELF, body: 'Mine' }), comment({ id: 'theirs', author: ENGINEER, body: 'Theirs' })], {
      'PATCH /api/studies/:id/comments/:cid': (req) => {
        patched.push([req.url.pathname.split('/').pop(), req.body]);
        return { body: comment({ id: 'theirs', resolved: true }) };
      },
    });
    const user = userEvent.setup();
    const mine = await screen.findByRole('article', { name: 'Comment by Ines Marlowe' });
    const theirs = screen.getByRole('article', { name: 'Comment by Oskar Penhale' });
    expect(within(mine).getByRole('button', { name: /Edit your comment/ })).toBeInTheDocument();
    expect(within(mine).getByRole('button', { name: /Delete the comment/ })).toBeInTheDocument();
    expect(within(theirs).queryByRole('button')).toBeNull();
    await user.click(screen.getByRole('button', { name: 'Resolve the thread by Oskar Penhale' }));
    await waitFor(() => expect(patched).toEqual([['theirs', { resolved: true }]]));
  });

  it('pins a comment to a result row of the latest revision', async () => {
    const posted: unknown[] = [];
    setup(
      'engineer',
      [],
      {
        'POST /api/studies/:id/comments': (req) => {
          posted.push(req.body);
          return { status: 201, body: comment() };
        },
      },
      [{ table: 'neutral-currents', key: 'DROP@HOUSE', label: 'Neutral current: DROP at HOUSE' }],
    );
    const user = userEvent.setup();
    const form = await screen.findByRole('form', { name: 'New comment' });
    await user.type(within(form).getByLabelText('New comment'), 'Is this current credible?');
    await user.selectOptions(within(form).getByLabelText('Pin to an element or result'), 'Neutral current: DROP at HOUSE');
    await user.click(within(form).getByRole('button', { name: 'Post comment' }));
    await waitFor(() => expect(posted).toEqual([{ body: 'Is this current credible?', anchor: { resultRow: { table: 'neutral-currents', key: 'DROP@HOUSE' } } }]));
  });
});
