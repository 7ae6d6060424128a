import { Link, useSearchParams } from 'react-router';
import { AUDIT_ACTION_WORDS, AUDIT_ACTIONS, AUDIT_FAMILY_WORDS, AUDIT_PAGE_SIZE } from '../../../../shared/api/audit.ts';
import { Button } from '../../../components/button.tsx';
import { controlClass } from '../../../components/field.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { useAudit, useAuditChoices, type AuditFilters } from '../api/get-audit.ts';
import { useDocumentTitle } from '../../../lib/document-title.ts';

/** Action families offered as prefixes ("review." = every review action). */
const PREFIXES = [...new Set(AUDIT_ACTIONS.map((a) => `${a.split('.')[0]}.`))];

/** The team's audit trail for owners: filter by study, action and actor; 50 events a page, newest first. */
export function AuditPage() {
  useDocumentTitle('Audit trail');
  const [search, setSearch] = useSearchParams();
  const filters: AuditFilters = {
    studyId: search.get('studyId') || undefined,
    action: search.get('action') || undefined,
    actor: search.get('actor') || undefined,
    page: Math.max(1, Number(search.get('page')) || 1),
  };
  const audit = useAudit(filters);
  const { studies, team } = useAuditChoices();
  const pages = audit.data ? Math.max(1, Math.ceil(audit.data.total / AUDIT_PAGE_SIZE)) : 1;

  const set = (key: string, value: string) =>
    setSearch((prev) => {
      const next = new URLSearchParams(prev);
      if (value) next.set(key, value);
      else next.delete(key);
      if (key !== 'page') next.delete('page');
      return next;
    });

  return (
    <div className="mx-auto flex max-w-6xl flex-col gap-4">
      <h1 className="text-xl">Audit trail</h1>
      <form aria-label="Audit filters" className="flex flex-wrap items-end gap-3 rounded-[4px] border border-rule bg-panel px-4 py-3" onSubmit={(e) => e.preventDefault()}>
        <label className="flex flex-col gap-1 text-[13px] font-semibold">
          Study
          <select className={`${controlClass} max-w-72`} value={filters.studyId ?? ''} onChange={(e) => set('studyId', e.target.value)}>
            <option value="">All studies</option>
            {(studies.data?.items ?? []).map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-[13px] font-semibold">
          Action
          <select className={controlClass} value={filters.action ?? ''} onChange={(e) => set('action', e.target.value)}>
            <option value="">All actions</option>
            <optgroup label="Families">
              {PREFIXES.map((p) => (
                <option key={p} value={p}>
                  All {AUDIT_FAMILY_WORDS[p] ?? p}
                </option>
              ))}
            </optgroup>
            <optgroup label="Actions">
              {AUDIT_ACTIONS.map((a) => (
                <option key={a} value={a}>
                  {AUDIT_ACTION_WORDS[a]}
                </option>
              ))}
            </optgroup>
          </select>
        </label>
        <label className="flex flex-col gap-1 text-[13px] font-semibold">
          Actor
          <select className={controlClass} value={filters.actor ?? ''} onChange={(e) => set('actor', e.target.value)}>
            <option value="">Anyone</option>
            {(team.data?.members ?? []).map((m) => (
              <option key={m.userId} value={m.userId}>
                {m.name}
              </option>
            ))}
          </select>
        </label>
        {filters.studyId || filters.action || filters.actor ? (
          <Button onClick={() => setSearch(new URLSearchParams())}>Clear filters</Button>
        ) : null}
      </form>
      {audit.isPending ? <Loading label="Loading the audit trail…" /> : null}
      {audit.isError ? <Notice tone="error" title="The audit trail could not be loaded.">{audit.error.message}</Notice> : null}
      {audit.data && audit.data.items.length === 0 ? <Notice>No events match these filters.</Notice> : null}
      {audit.data && audit.data.items.length > 0 ? (
        <div className="relative overflow-x-auto rounded-[4px] border border-rule bg-panel">
          <table aria-label="Audit events" className="w-full border-collapse text-[13px] [&_td]:border-t [&_td]:border-rule [&_td]:px-3 [&_td]:py-1.5 [&_td]:align-top [&_th]:px-3 [&_th]:py-1.5 [&_th]:text-left [&_th]:font-semibold [&_th]:text-ink-muted">
            <thead>
              <tr>
                <th scope="col">When</th>
                <th scope="col">Who</th>
                <th scope="col">Action</th>
                <th scope="col">Study</th>
                <th scope="col">Detail</th>
              </tr>
            </thead>
            <tbody>
              {audit.data.items.map((e) => (
                <tr key={e.id}>
                  <td className="num whitespace-nowrap">
                    <time dateTime={e.at}>{formatDateTime(e.at)}</time>
                  </td>
                  <td>{e.actor.name}</td>
                  <td>{e.actionLabel}</td>
                  <td className="min-w-48 [overflow-wrap:anywhere]">
                    {e.study && !e.study.deleted ? (
                      <Link to={`/studies/${e.study.id}`} className="text-accent hover:underline">
                        {e.study.name}
                      </Link>
                    ) : e.study ? (
                      <span>
                        {e.study.name} <span className="text-ink-muted">(deleted)</span>
                      </span>
                    ) : (
                      '—'
                    )}
                  </td>
                  <td className="max-w-md break-words text-[12px] text-ink-muted">{e.text}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {audit.data && pages > 1 ? (
        <nav aria-label="Pages" className="flex items-center gap-2 text-[13px]">
          <Button size="sm" disabled={filters.page <= 1} onClick={() => set('page', String(filters.page - 1))}>
            Previous page
          </Button>
          <span className="num">
            Page {filters.page} of {pages} ({audit.data.total} events)
          </span>
          <Button size="sm" disabled={filters.page >= pages} onClick={() => set('page', String(filters.page + 1))}>
            Next page
          </Button>
        </nav>
      ) : null}
    </div>
  );
}
