/**
 * Comments on a study: plain-text threads (a root and its replies), optionally anchored to an
 * element by id (so the pin follows the element when it moves) or to a result row; resolve and
 * reopen; edit and delete one's own; @mentions notify team members. Text is stored and returned
 * verbatim and never rendered as HTML by the server; e-mails escape it.
 */
import { anchorWords, circuitNames } from '../../shared/review/user-names.ts';
import { and, asc, eq, inArray, isNull } from 'drizzle-orm';
import type { Comment, CommentAnchor, CreateCommentRequest, UpdateCommentRequest } from '../../shared/api/comments.ts';
import { findMentions } from '../../shared/review/mentions.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { comments, memberships, users } from '../db/schema.ts';
import { AppError, fieldError, isUuid, notFound } from '../errors.ts';
import type { Mailer } from '../mail/index.ts';
import { recordAudit } from './audit.ts';
import { notify, studyLink } from './notifications.ts';
import { latestRevision } from './revisions.ts';
import { getStudy } from './studies.ts';

type Row = typeof comments.$inferSelect;

async function names(db: Db, ids: string[]): Promise<Map<string, string>> {
  const unique = [...new Set(ids)];
  if (unique.length === 0) return new Map();
  const rows = await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, unique));
  return new Map(rows.map((r) => [r.id, r.name]));
}

async function toComments(db: Db, rows: Row[]): Promise<Comment[]> {
  const n = await names(db, rows.flatMap((r) => [r.authorId, ...(r.resolvedBy ? [r.resolvedBy] : []), ...r.mentions]));
  const ref = (id: string) => ({ id, name: n.get(id) ?? '(removed)' });
  return rows.map((r) => {
    const deleted = r.deletedAt !== null;
    return {
      id: r.id,
      parentId: r.parentId,
      author: ref(r.authorId),
      body: deleted ? '' : r.body,
      anchor: (r.anchor as CommentAnchor | null) ?? null,
      revision: r.revision,
      mentions: deleted ? [] : r.mentions.map(ref),
      resolved: r.resolvedAt !== null,
      resolvedBy: r.resolvedBy ? ref(r.resolvedBy) : null,
      resolvedAt: r.resolvedAt?.toISOString() ?? null,
      createdAt: r.createdAt.toISOString(),
      editedAt: r.editedAt?.toISOString() ?? null,
      deleted,
    };
  });
}

/** The study's comments, oldest first (threads by parentId). */
export async function listComments(db: Db, actor: Actor, studyId: string): Promise<{ items: Comment[] }> {
  await getStudy(db, actor, studyId);
  const rows = await db.select().from(comments).where(eq(comments.studyId, studyId)).orderBy(asc(comments.createdAt), asc(comments.id));
  return { items: await toComments(db, rows) };
}

async function oneComment(db: Db, actor: Actor, studyId: string, commentId: string): Promise<Row> {
  await getStudy(db, actor, studyId);
  if (!isUuid(commentId)) throw notFound('Comment');
  const [row] = await db
    .select()
    .from(comments)
    .where(and(eq(comments.id, commentId), eq(comments.studyId, studyId), eq(comments.teamId, actor.teamId), isNull(comments.deletedAt)))
    .limit(1);
  if (!row) throw notFound('Comment');
  return row;
}

/** Team members who may be mentioned. */
async function teamMembers(db: Db, teamId: string) {
  return db
    .select({ id: users.id, name: users.name, email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.teamId, teamId));
}

/** Sends mention notifications for the members newly mentioned in `body`. */
async function notifyMentions(
  db: Db,
  mailer: Mailer,
  appUrl: string,
  actor: Actor,
  studyId: string,
  studyName: string,
  body: string,
  mentioned: { id: string; name: string; email: string }[],
  where?: string,
) {
  await notify(db, mailer, {
    kind: 'mention',
    teamId: actor.teamId,
    studyId,
    actorId: actor.userId,
    recipients: mentioned,
    text: `${actor.name} mentioned you in a comment on ${where ? `${where} of ` : ''}"${studyName}".`,
    subject: `${actor.name} mentioned you: ${studyName}`,
    quote: body,
    link: studyLink(appUrl, studyId),
  });
}

/** Adds a comment or a reply. */
export async function createComment(db: Db, mailer: Mailer, appUrl: string, actor: Actor, studyId: string, input: CreateCommentRequest): Promise<Comment> {
  const study = await getStudy(db, actor, studyId);
  let parentId: string | null = null;
  if (input.parentId !== undefined) {
    if (!isUuid(input.parentId)) throw fieldError('parentId', 'No such comment on this study.');
    const [parent] = await db
      .select({ id: comments.id, parentId: comments.parentId })
      .from(comments)
      .where(and(eq(comments.id, input.parentId), eq(comments.studyId, studyId)))
      .limit(1);
    if (!parent) throw fieldError('parentId', 'No such comment on this study.');
    parentId = parent.parentId ?? parent.id; // replies attach to the thread's root
    if (input.anchor) throw fieldError('anchor', 'A reply has no anchor of its own; the thread is anchored.');
  }
  const latest = await latestRevision(db, studyId);
  let anchor = input.anchor;
  const circuit = (latest?.content as { circuit?: { elements?: { id?: unknown }[] } } | undefined)?.circuit ?? study.content.circuit;
  if (anchor && 'elementId' in anchor) {
    // A thread on the hidden switch of an opened connection belongs to the element the user drew.
    anchor = { elementId: circuitNames(circuit).drawnElement(anchor.elementId) };
    const ids = new Set((circuit.elements ?? []).map((e) => (e as { id?: unknown }).id));
    if (!ids.has(anchor.elementId)) throw fieldError('anchor.elementId', `There is no element "${anchor.elementId}" in this study.`);
  }
  const mentioned = findMentions(input.body, await teamMembers(db, actor.teamId)).filter((m) => m.id !== actor.userId);
  const [row] = await db
    .insert(comments)
    .values({
      studyId,
      teamId: actor.teamId,
      parentId,
      authorId: actor.userId,
      body: input.body,
      anchor: anchor ?? null,
      revision: latest?.number ?? null,
      mentions: mentioned.map((m) => m.id),
    })
    .returning();
  await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: 'comment.create', studyId, detail: { commentId: row.id, parentId, anchor: anchor ?? null } });
  // The mail says where the comment points, in the names the user drew ("element KITCHEN").
  await notifyMentions(db, mailer, appUrl, actor, studyId, study.name, input.body, mentioned, anchor ? anchorWords(anchor, circuitNames(circuit)) : undefined);
  return (await toComments(db, [row]))[0];
}

/** Edits one's own comment, or resolves / reopens a thread. */
export async function updateComment(db: Db, mailer: Mailer, appUrl: string, actor: Actor, studyId: string, commentId: string, input: UpdateCommentRequest): Promise<Comment> {
  const row = await oneComment(db, actor, studyId, commentId);
  const changes: Partial<typeof comments.$inferInsert> = {};
  let newlyMentioned: { id: string; name: string; email: string }[] = [];
  if (input.body !== undefined && input.body !== row.body) {
    if (row.authorId !== actor.userId) throw new AppError(403, 'forbidden', 'You can only edit your own comments.');
    const mentioned = findMentions(input.body, await teamMembers(db, actor.teamId)).filter((m) => m.id !== actor.userId);
    newlyMentioned = mentioned.filter((m) => !row.mentions.includes(m.id));
    changes.body = input.body;
    changes.editedAt = new Date();
    changes.mentions = mentioned.map((m) => m.id);
  }
  if (input.resolved !== undefined && input.resolved !== (row.resolvedAt !== null)) {
    if (row.parentId !== null) throw fieldError('resolved', 'Resolve the thread (its first comment), not a reply.');
    changes.resolvedAt = input.resolved ? new Date() : null;
    changes.resolvedBy = input.resolved ? actor.userId : null;
  }
  if (Object.keys(changes).length === 0) return (await toComments(db, [row]))[0];
  const [updated] = await db.update(comments).set(changes).where(eq(comments.id, row.id)).returning();
  if (changes.body !== undefined) {
    await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: 'comment.edit', studyId, detail: { commentId: row.id } });
  }
  if (changes.resolvedAt !== undefined) {
    await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: input.resolved ? 'comment.resolve' : 'comment.reopen', studyId, detail: { commentId: row.id } });
  }
  if (newlyMentioned.length > 0) {
    const study = await getStudy(db, actor, studyId);
    await notifyMentions(db, mailer, appUrl, actor, studyId, study.name, updated.body, newlyMentioned);
  }
  return (await toComments(db, [updated]))[0];
}

/** Deletes a comment (its author, or an owner); it stays in its thread as "deleted". */
export async function deleteComment(db: Db, actor: Actor, studyId: string, commentId: string): Promise<void> {
  const row = await oneComment(db, actor, studyId, commentId);
  if (row.authorId !== actor.userId && actor.role !== 'owner') throw new AppError(403, 'forbidden', 'You can only delete your own comments.');
  await db.update(comments).set({ deletedAt: new Date() }).where(eq(comments.id, row.id));
  await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: 'comment.delete', studyId, detail: { commentId: row.id, authorId: row.authorId } });
}
