import { QueryClientProvider } from '@tanstack/react-query';
import { renderHook, waitFor } from '@testing-library/react';
import type { ReactNode } from 'react';
import { describe, expect, it } from 'vitest';
import { useCommentPins } from '../../../../../src/features/review/api/use-comment-pins.ts';
import { stubApi } from '../../../helpers/fake-api.ts';
import { testQueryClient } from '../../../helpers/render-app.tsx';
import { comment, STUDY_ID } from '../review-fixtures.ts';

describe('comment pins', () => {
  it('counts open, undeleted threads per element; replies, resolved threads and result-row anchors do not pin', async () => {
    stubApi({
      'GET /api/studies/:id/comments': () => ({
        body: {
          items: [
            comment({ id: 't1', anchor: { elementId: 'DROP' } }),
            comment({ id: 't2', anchor: { elementId: 'DROP' } }),
            comment({ id: 'r1', parentId: 't1' }),
            comment({ id: 't3', anchor: { elementId: 'SRC' }, resolved: true }),
            comment({ id: 't4', anchor: { elementId: 'LOAD-A' }, deleted: true, body: '' }),
            comment({ id: 't5', anchor: { resultRow: { table: 'bus-voltages', key: 'HOUSE' } } }),
            comment({ id: 't6', anchor: { elementId: 'LOAD-A' } }),
          ],
        },
      }),
    });
    const client = testQueryClient();
    const wrapper = ({ children }: { children: ReactNode }) => <QueryClientProvider client={client}>{children}</QueryClientProvider>;
    const { result, rerender } = renderHook(() => useCommentPins(STUDY_ID), { wrapper });
    await waitFor(() => expect(result.current).toEqual([{ elementId: 'DROP', count: 2 }, { elementId: 'LOAD-A', count: 1 }]));
    const first = result.current;
    rerender();
    expect(result.current).toBe(first); // stable while the comments are unchanged
  });
});
