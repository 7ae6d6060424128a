/** The audit trail: every sign-up, study change, invite and role change is recorded with who, what, when and which study. */
import { and, count, desc, eq, inArray, like } from 'drizzle-orm';
import { AUDIT_PAGE_SIZE, type AuditAction, type AuditListResponse, type AuditQuery } from '../../shared/api/audit.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { auditEvents, studies, users } from '../db/schema.ts';
import { isUuid } from '../errors.ts';
import { circuitNames } from '../../shared/review/user-names.ts';
import { actionWords, auditText } from './audit-words.ts';

/** A Drizzle client or an open transaction (both can insert). */
type Writer = Pick<Db, 'insert'>;

/** Records one event. */
export async function recordAudit(
  db: Writer,
  e: { teamId: string; actorId: string; action: AuditAction; studyId?: string | null; detail?: Record<string, unknown> },
): Promise<void> {
  await db.insert(auditEvents).values({
    teamId: e.teamId,
    actorId: e.actorId,
    action: e.action,
    studyId: e.studyId ?? null,
    detail: e.detail ?? {},
  });
}

/** The team's events, newest first, optionally of one study, one action (or action prefix) and one actor. */
export async function listAudit(db: Db, actor: Actor, q: AuditQuery): Promise<AuditListResponse> {
  if (q.studyId !== undefined && !isUuid(q.studyId)) return { items: [], total: 0 };
  if (q.actor && !isUuid(q.actor)) return { items: [], total: 0 };
  // An action ending in "." is a prefix (`review.` = every review action); LIKE wildcards are escaped.
  const action = q.action
    ? q.action.endsWith('.')
      ? like(auditEvents.action, `${q.action.replace(/[\\%_]/g, (c) => `\\${c}`)}%`)
      : eq(auditEvents.action, q.action)
    : undefined;
  const where = and(
    eq(auditEvents.teamId, actor.teamId),
    q.studyId ? eq(auditEvents.studyId, q.studyId) : undefined,
    action,
    q.actor ? eq(auditEvents.actorId, q.actor) : undefined,
  );
  const [rows, [{ total }]] = await Promise.all([
    db
      .select({
        id: auditEvents.id,
        at: auditEvents.at,
        actorId: auditEvents.actorId,
        actorName: users.name,
        action: auditEvents.action,
        studyId: auditEvents.studyId,
        detail: auditEvents.detail,
      })
      .from(auditEvents)
      .innerJoin(users, eq(users.id, auditEvents.actorId))
      .where(where)
      .orderBy(desc(auditEvents.at), desc(auditEvents.id))
      .limit(AUDIT_PAGE_SIZE)
      .offset((q.page - 1) * AUDIT_PAGE_SIZE),
    db.select({ total: count() }).from(auditEvents).where(where),
  ]);
  // Names of the members and studies the details point at (removed members and deleted studies included).
  const ids = new Set<string>();
  const studyIds = new Set<string>();
  const collect = (v: unknown): void => {
    if (typeof v === 'string' && isUuid(v)) ids.add(v);
    else if (Array.isArray(v)) v.forEach(collect);
    else if (v && typeof v === 'object') Object.values(v).forEach(collect);
  };
  for (const r of rows) {
    collect(r.detail);
    if (r.studyId) studyIds.add(r.studyId);
  }
  const [userRows, studyRows] = await Promise.all([
    ids.size > 0 ? db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, [...ids])) : [],
    ids.size + studyIds.size > 0
      ? db
          .select({ id: studies.id, name: studies.name, deletedAt: studies.deletedAt })
          .from(studies)
          .where(and(eq(studies.teamId, actor.teamId), inArray(studies.id, [...new Set([...ids, ...studyIds])])))
      : [],
  ]);
  const userName = new Map(userRows.map((u) => [u.id, u.name]));
  const studyById = new Map(studyRows.map((s) => [s.id, s]));
  // A comment's anchor reads in the names of its study's circuit as drawn.
  const anchored = [...new Set(rows.filter((r) => r.action === 'comment.create' && r.studyId).map((r) => r.studyId!))];
  const circuits = new Map(
    (anchored.length > 0 ? await db.select({ id: studies.id, content: studies.content }).from(studies).where(and(eq(studies.teamId, actor.teamId), inArray(studies.id, anchored))) : []).map(
      (s) => [s.id, circuitNames((s.content as { circuit?: unknown } | null)?.circuit)] as const,
    ),
  );
  const names = { user: (id: string) => userName.get(id), study: (id: string) => studyById.get(id)?.name };
  return {
    items: rows.map((r) => {
      const s = r.studyId ? studyById.get(r.studyId) : undefined;
      return {
        id: r.id,
        at: r.at.toISOString(),
        actor: { id: r.actorId, name: r.actorName },
        action: r.action,
        actionLabel: actionWords(r.action),
        studyId: r.studyId,
        study: s ? { id: s.id, name: s.name, deleted: s.deletedAt !== null } : null,
        text: auditText(r.action, r.detail, { ...names, circuit: r.studyId ? circuits.get(r.studyId) : undefined }),
        detail: r.detail,
      };
    }),
    total,
  };
}
