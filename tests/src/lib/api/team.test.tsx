/** GET /api/team has one client: the team page's, the reviewer picker's and the audit filters' queries share one key and one fetch. */
import { QueryClient, QueryClientProvider, useQuery } from '@tanstack/react-query';
import { render, screen, waitFor } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { useMembers } from '../../../../src/features/review/api/get-members.ts';
import { useAuditChoices } from '../../../../src/features/audit/api/get-audit.ts';
import { teamQueryOptions, useTeam } from '../../../../src/lib/api/team.ts';
import { stubApi } from '../../helpers/fake-api.ts';
import { team } from '../../features/review/review-fixtures.ts';

function Readers() {
  const a = useTeam();
  const b = useMembers();
  const c = useAuditChoices().team;
  const d = useQuery(teamQueryOptions());
  return <p>{[a, b, c, d].map((q) => q.data?.members.length ?? '-').join(' ')}</p>;
}

describe('GET /api/team client', () => {
  it('one query function under one key: four readers, one request, the same data', async () => {
    const api = stubApi({ 'GET /api/team': () => ({ body: team() }), 'GET /api/studies': () => ({ body: { items: [], total: 0, page: 1, pageSize: 100 } }) });
    const n = team().members.length;
    render(
      <QueryClientProvider client={new QueryClient({ defaultOptions: { queries: { retry: false } } })}>
        <Readers />
      </QueryClientProvider>,
    );
    await waitFor(() => expect(screen.getByText(`${n} ${n} ${n} ${n}`)).toBeInTheDocument());
    expect(api.calls.filter((c) => c.url.pathname === '/api/team')).toHaveLength(1);
  });
});
