import { useMemo, useState } from 'react';
import type { Role } from '../../../../shared/api/common.ts';
import type { Comment, CommentAnchor } from '../../../../shared/api/comments.ts';
import { COMMENT_MAX } from '../../../../shared/api/comments.ts';
import { findMentions } from '../../../../shared/review/mentions.ts';
import type { ResultsSummary } from '../../../../shared/review/summary.ts';
import { anchorWords, circuitNames, isPrivateName, type CircuitNames } from '../../../../shared/review/user-names.ts';
import { Button } from '../../../components/button.tsx';
import { ConfirmDialog } from '../../../components/dialog.tsx';
import { controlClass } from '../../../components/field.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { useCreateComment, useDeleteComment, useUpdateComment } from '../api/comment-mutations.ts';
import { useComments } from '../api/get-comments.ts';
import { useMembers } from '../api/get-members.ts';
import { canComment } from '../utils/permissions.ts';

interface Viewer {
  studyId: string;
  role: Role;
  userId: string;
  /** Names of the study's circuit as drawn, so anchors read in the user's words. */
  names: CircuitNames;
}

/** Where a thread points, in words ("Element KITCHEN", "Bus voltages at HOUSE"), with the names the user drew. */
export function anchorText(anchor: CommentAnchor | null, names: CircuitNames = circuitNames(null)): string | null {
  if (!anchor) return null;
  const words = anchorWords(anchor, names);
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** The ids of the elements drawn in a stored circuit (JSON read defensively; hidden switches of opened connections left out). */
export function circuitElementIds(circuit: { elements: unknown[] } | undefined): string[] {
  if (!circuit) return [];
  const ids = circuit.elements.map((e) => (e && typeof e === 'object' && typeof (e as { id?: unknown }).id === 'string' ? (e as { id: string }).id : null));
  return ids.filter((x): x is string => x !== null && !isPrivateName(x));
}

/** Text box with a live list of who will be notified (mentions resolved by the same rule as the server). */
function CommentBox({ label, value, onChange, autoFocus }: { label: string; value: string; onChange: (v: string) => void; autoFocus?: boolean }) {
  const members = useMembers();
  const mentioned = useMemo(
    () => (members.data ? findMentions(value, members.data.members.map((m) => ({ id: m.userId, name: m.name, email: m.email }))) : []),
    [members.data, value],
  );
  return (
    <div className="flex flex-col gap-1">
      <label className="flex flex-col gap-1 text-[13px] font-semibold">
        {label}
        <textarea
          className={`${controlClass} h-auto min-h-16 w-full font-normal`}
          value={value}
          maxLength={COMMENT_MAX}
          onChange={(e) => onChange(e.target.value)}
          autoFocus={autoFocus}
        />
      </label>
      <p className="text-[12px] text-ink-muted">
        {mentioned.length > 0 ? `Will notify: ${mentioned.map((m) => m.name).join(', ')}` : 'Mention a team member with @ and their e-mail name (for example @idunn).'}
      </p>
    </div>
  );
}

function CommentItem({ c, viewer, isRoot }: { c: Comment; viewer: Viewer; isRoot: boolean }) {
  const update = useUpdateComment(viewer.studyId);
  const remove = useDeleteComment(viewer.studyId);
  const [editing, setEditing] = useState(false);
  const [draft, setDraft] = useState(c.body);
  const [confirm, setConfirm] = useState(false);
  const own = c.author.id === viewer.userId;
  const anchor = isRoot ? anchorText(c.anchor, viewer.names) : null;

  return (
    <article aria-label={`Comment by ${c.author.name}`} className={isRoot ? '' : 'ml-5 border-l-2 border-rule pl-3'}>
      <header className="flex flex-wrap items-baseline gap-x-2 text-[12px] text-ink-muted">
        <span className="text-[13px] font-semibold text-ink">{c.author.name}</span>
        <time dateTime={c.createdAt} className="num">
          {formatDateTime(c.createdAt)}
        </time>
        {c.revision !== null ? <span>on revision {c.revision}</span> : null}
        {c.editedAt ? <span>(edited)</span> : null}
        {anchor ? <span className="rounded-[2px] border border-accent/40 bg-accent-soft px-1 text-accent">{anchor}</span> : null}
      </header>
      {c.deleted ? (
        <p className="text-[13px] italic text-ink-muted">Comment deleted.</p>
      ) : editing ? (
        <form
          className="mt-1 flex flex-col gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (!draft.trim()) return;
            update.mutate({ commentId: c.id, body: { body: draft } }, { onSuccess: () => setEditing(false) });
          }}
        >
          <CommentBox label="Edit comment" value={draft} onChange={setDraft} autoFocus />
          {update.isError ? <Notice tone="error">{update.error.message}</Notice> : null}
          <div className="flex gap-2">
            <Button size="sm" type="submit" variant="primary" busy={update.isPending} busyText="Saving…" disabled={!draft.trim()}>
              Save
            </Button>
            <Button size="sm" onClick={() => { setEditing(false); setDraft(c.body); }}>
              Cancel
            </Button>
          </div>
        </form>
      ) : (
        // Plain text only: React escapes it; pre-wrap keeps the writer's line breaks.
        <p className="mt-0.5 whitespace-pre-wrap break-words text-sm">{c.body}</p>
      )}
      {!c.deleted && !editing ? (
        <div className="mt-0.5 flex gap-1">
          {own && canComment(viewer.role) ? (
            <Button size="sm" variant="ghost" onClick={() => setEditing(true)} aria-label={`Edit your comment of ${formatDateTime(c.createdAt)}`}>
              Edit
            </Button>
          ) : null}
          {own || viewer.role === 'owner' ? (
            <Button size="sm" variant="ghost" onClick={() => { remove.reset(); setConfirm(true); }} aria-label={`Delete the comment by ${c.author.name} of ${formatDateTime(c.createdAt)}`}>
              Delete
            </Button>
          ) : null}
        </div>
      ) : null}
      <ConfirmDialog
        open={confirm}
        title="Delete this comment?"
        confirmLabel="Delete comment"
        busy={remove.isPending}
        error={remove.error?.message}
        onCancel={() => setConfirm(false)}
        onConfirm={() => remove.mutate(c.id, { onSuccess: () => setConfirm(false) })}
      >
        <p>The thread keeps its place; the text is removed.</p>
      </ConfirmDialog>
    </article>
  );
}

function Thread({ root, replies, viewer }: { root: Comment; replies: Comment[]; viewer: Viewer }) {
  const create = useCreateComment(viewer.studyId);
  const update = useUpdateComment(viewer.studyId);
  const [replying, setReplying] = useState(false);
  const [reply, setReply] = useState('');
  const may = canComment(viewer.role);
  const anchor = anchorText(root.anchor, viewer.names);
  return (
    <li
      aria-label={`Thread by ${root.author.name}${anchor ? `, ${anchor}` : ''}${root.resolved ? ', resolved' : ''}`}
      className={`flex flex-col gap-2 rounded-[3px] border px-3 py-2 ${root.resolved ? 'border-rule bg-sunken/50' : 'border-rule-strong bg-panel'}`}
    >
      {root.resolved ? (
        <p className="text-[12px] text-ok">
          <span aria-hidden="true">✓ </span>Resolved{root.resolvedBy ? ` by ${root.resolvedBy.name}` : ''}
        </p>
      ) : null}
      <CommentItem c={root} viewer={viewer} isRoot />
      {replies.map((r) => (
        <CommentItem key={r.id} c={r} viewer={viewer} isRoot={false} />
      ))}
      {may ? (
        <div className="flex flex-wrap gap-1">
          {!replying ? (
            <Button size="sm" onClick={() => setReplying(true)} aria-label={`Reply to ${root.author.name}`}>
              Reply
            </Button>
          ) : null}
          <Button
            size="sm"
            busy={update.isPending}
            busyText="Saving…"
            onClick={() => update.mutate({ commentId: root.id, body: { resolved: !root.resolved } })}
            aria-label={`${root.resolved ? 'Reopen' : 'Resolve'} the thread by ${root.author.name}`}
          >
            {root.resolved ? 'Reopen' : 'Resolve'}
          </Button>
        </div>
      ) : null}
      {update.isError ? <Notice tone="error">{update.error.message}</Notice> : null}
      {replying ? (
        <form
          className="flex flex-col gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (!reply.trim()) return;
            create.mutate({ body: reply, parentId: root.id }, { onSuccess: () => { setReply(''); setReplying(false); } });
          }}
        >
          <CommentBox label="Reply" value={reply} onChange={setReply} autoFocus />
          {create.isError ? <Notice tone="error">{create.error.message}</Notice> : null}
          <div className="flex gap-2">
            <Button size="sm" type="submit" variant="primary" busy={create.isPending} busyText="Posting…" disabled={!reply.trim()}>
              Post reply
            </Button>
            <Button size="sm" onClick={() => setReplying(false)}>
              Cancel
            </Button>
          </div>
        </form>
      ) : null}
    </li>
  );
}

/**
 * Comment threads on a study, optionally anchored to an element (by id, so the pin survives moves)
 * or a result row. Reviewers and above write; viewers read.
 */
/** A result row a thread may point at (table and key as the results summary names them). */
export interface ResultRowChoice {
  table: string;
  key: string;
  label: string;
}

/**
 * Result rows of a revision's summary: bus voltages by bus, neutral currents by element and bus,
 * labelled with the names the user drew (a hidden switch's row is its element's, so it is left out).
 */
export function resultRowChoices(summary: ResultsSummary | undefined, names: CircuitNames = circuitNames(null)): ResultRowChoice[] {
  if (!summary || !summary.ok) return [];
  return [
    ...summary.buses.map((b) => ({ table: 'bus-voltages', key: b.bus, label: `Bus voltages: ${names.bus(b.bus)}` })),
    ...summary.neutralCurrents
      .filter((n) => !names.isHidden(n.elementId))
      .map((n) => ({ table: 'neutral-currents', key: n.key, label: `Neutral current: ${n.elementId} at ${names.drawnBus(n.bus)}` })),
  ];
}

export function CommentsPanel({
  studyId,
  role,
  userId,
  elementIds,
  resultRows = [],
  selectedElementId,
  circuit,
}: Omit<Viewer, 'names'> & { elementIds: string[]; resultRows?: ResultRowChoice[]; selectedElementId?: string | null; circuit?: unknown }) {
  const comments = useComments(studyId);
  const create = useCreateComment(studyId);
  const [body, setBody] = useState('');
  const [anchorId, setAnchorId] = useState('');
  const names = useMemo(() => circuitNames(circuit), [circuit]);
  const viewer: Viewer = { studyId, role, userId, names };

  const threads = useMemo(() => {
    const items = comments.data?.items ?? [];
    const roots = items.filter((c) => c.parentId === null);
    return roots.map((root) => ({ root, replies: items.filter((c) => c.parentId === root.id) }));
  }, [comments.data]);
  const open = threads.filter((t) => !t.root.resolved).length;
  const fieldError = isApiError(create.error) ? Object.values(create.error.fields)[0] : undefined;

  return (
    <section aria-labelledby="comments-title" className="flex flex-col gap-3 rounded-[4px] border border-rule bg-panel px-4 py-3">
      <h2 id="comments-title" className="text-base">
        Comments <span className="text-[13px] font-normal text-ink-muted">({open} open)</span>
      </h2>
      {canComment(role) ? (
        <form
          aria-label="New comment"
          className="flex flex-col gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (!body.trim()) return;
            const row = anchorId.startsWith('row:') ? resultRows[Number(anchorId.slice(4))] : undefined;
            const anchor: CommentAnchor | undefined = row ? { resultRow: { table: row.table, key: row.key } } : anchorId.startsWith('el:') ? { elementId: anchorId.slice(3) } : undefined;
            create.mutate({ body, anchor }, { onSuccess: () => { setBody(''); setAnchorId(''); } });
          }}
        >
          <CommentBox label="New comment" value={body} onChange={setBody} />
          <div className="flex flex-wrap items-end gap-2">
            <label className="flex flex-col gap-1 text-[13px] font-semibold">
              Pin to an element or result
              <select className={controlClass} value={anchorId} onChange={(e) => setAnchorId(e.target.value)}>
                <option value="">The whole study</option>
                <optgroup label="Elements">
                  {elementIds.map((id) => (
                    <option key={id} value={`el:${id}`}>
                      {id}
                    </option>
                  ))}
                </optgroup>
                {resultRows.length > 0 ? (
                  <optgroup label="Result rows (latest revision)">
                    {resultRows.map((r, i) => (
                      <option key={`${r.table}:${r.key}`} value={`row:${i}`}>
                        {r.label}
                      </option>
                    ))}
                  </optgroup>
                ) : null}
              </select>
            </label>
            {selectedElementId && elementIds.includes(selectedElementId) ? (
              <Button size="md" onClick={() => setAnchorId(`el:${selectedElementId}`)}>
                Comment on the selected element ({selectedElementId})
              </Button>
            ) : null}
            <Button type="submit" variant="primary" busy={create.isPending} busyText="Posting…" disabled={!body.trim()}>
              Post comment
            </Button>
          </div>
          {create.isError ? <Notice tone="error" title="The comment was not posted.">{fieldError ?? create.error.message}</Notice> : null}
        </form>
      ) : (
        <p className="text-[13px] text-ink-muted">Viewers read comments; reviewers, engineers and owners write them.</p>
      )}
      {comments.isPending ? <Loading label="Loading comments…" /> : null}
      {comments.isError ? <Notice tone="error" title="Comments could not be loaded.">{comments.error.message}</Notice> : null}
      {comments.data && threads.length === 0 ? <p className="text-[13px] text-ink-muted">No comments yet.</p> : null}
      {threads.length > 0 ? (
        <ul aria-label="Comment threads" className="flex flex-col gap-2">
          {threads.map((t) => (
            <Thread key={t.root.id} root={t.root} replies={t.replies} viewer={viewer} />
          ))}
        </ul>
      ) : null}
    </section>
  );
}
