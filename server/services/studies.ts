/** Studies: team-scoped, soft-deleted, optimistically versioned. A study of another team is "not found". */
import { and, asc, count, desc, eq, ilike, inArray, isNull, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { studyRevisions } from '../db/schema.ts';
import {
  emptyStudyContent,
  type CloneStudyRequest,
  type CreateStudyRequest,
  type CreatedStudy,
  type ListStudiesQuery,
  type ListStudiesResponse,
  type StudyContent,
  type StudyDetail,
  type StudySummary,
  type TemplateListResponse,
  type UpdateStudyRequest,
} from '../../shared/api/studies.ts';
import type { RevisionSummary } from '../../shared/api/revisions.ts';
import { PRIVATE_MARK } from '../../shared/review/user-names.ts';
import { revisionRisk } from '../../shared/review/risk.ts';
import type { ResultsSummary } from '../../shared/review/summary.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { reviewEvents, studies, users } from '../db/schema.ts';
import { AppError, isUuid, notFound } from '../errors.ts';
import { recordAudit } from './audit.ts';
import { cancelStudySweeps } from './sweep-store.ts';
import { appendRevision, appendRevisionOfStoredContent, ensureRevision, getRevision, latestRevision, listRevisions, sameContent, type Conn } from './revisions.ts';
import { checkContent } from './study-content.ts';

const createdByUser = alias(users, 'created_by_user');
const updatedByUser = alias(users, 'updated_by_user');
const source = alias(studies, 'source_study');

/**
 * Elements the user drew: the hidden switch behind an opened connection (an id with the private
 * marker "~", shared/review/user-names.ts) is not one of them.
 */
const elementCount = sql<number>`case when jsonb_typeof(${studies.content}->'circuit'->'elements') = 'array'
  then (select count(*) from jsonb_array_elements(${studies.content}->'circuit'->'elements') as e(el)
        where strpos(coalesce(e.el->>'id', ''), ${PRIVATE_MARK}) = 0) else 0 end`.mapWith(Number);

/** Number of a study's latest revision: the one number users read (the edit `version` is internal). */
const latestRevisionNumber = sql<number | null>`(select max(${studyRevisions.number}) from ${studyRevisions} where ${studyRevisions.studyId} = ${studies.id})`.mapWith(
  (v: unknown) => (v === null ? null : Number(v)),
);

const summaryColumns = {
  id: studies.id,
  name: studies.name,
  description: studies.description,
  status: studies.status,
  isTemplate: studies.isTemplate,
  version: studies.version,
  createdById: studies.createdBy,
  createdByName: createdByUser.name,
  updatedById: studies.updatedBy,
  updatedByName: updatedByUser.name,
  createdAt: studies.createdAt,
  updatedAt: studies.updatedAt,
  elementCount,
  revision: latestRevisionNumber,
  approvedRevision: studies.approvedRevision,
};

type SummaryRow = {
  id: string;
  name: string;
  description: string;
  status: StudySummary['status'];
  isTemplate: boolean;
  version: number;
  createdById: string;
  createdByName: string;
  updatedById: string;
  updatedByName: string;
  createdAt: Date;
  updatedAt: Date;
  elementCount: number;
  revision: number | null;
  approvedRevision: number | null;
};

function toSummary(r: SummaryRow): StudySummary {
  return {
    id: r.id,
    name: r.name,
    description: r.description,
    status: r.status,
    isTemplate: r.isTemplate,
    version: r.version,
    createdBy: { id: r.createdById, name: r.createdByName },
    updatedBy: { id: r.updatedById, name: r.updatedByName },
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
    elementCount: r.elementCount,
    revision: r.revision ?? null,
  };
}

/** The live (not deleted) studies of the actor's team, as a WHERE clause. */
export function visible(actor: Actor, id?: string): SQL {
  return and(eq(studies.teamId, actor.teamId), isNull(studies.deletedAt), id ? eq(studies.id, id) : undefined)!;
}

/** Escapes LIKE wildcards so `q` is matched literally. */
function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** One page of the team's studies. */
export async function listStudies(db: Db, actor: Actor, q: ListStudiesQuery): Promise<ListStudiesResponse> {
  const where = and(
    visible(actor),
    q.q ? ilike(studies.name, likePattern(q.q)) : undefined,
    q.template ? eq(studies.isTemplate, q.template === 'true') : undefined,
  );
  const order = q.dir === 'asc' ? asc : desc;
  const sortColumn = q.sort === 'name' ? sql`lower(${studies.name})` : studies.updatedAt;
  const rows = await db
    .select(summaryColumns)
    .from(studies)
    .innerJoin(createdByUser, eq(createdByUser.id, studies.createdBy))
    .innerJoin(updatedByUser, eq(updatedByUser.id, studies.updatedBy))
    .where(where)
    .orderBy(order(sortColumn), order(studies.id))
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize);
  const [{ total }] = await db.select({ total: count() }).from(studies).where(where);
  // Templates carry the danger of what a copy starts from, so "Start from template" can state it.
  const items = await Promise.all(rows.map(async (r) => (r.isTemplate ? { ...toSummary(r), risk: await templateRisk(db, r.id, r.approvedRevision) } : toSummary(r))));
  return { items, total, page: q.page, pageSize: q.pageSize };
}

/**
 * The danger of the revision a copy of a template starts from (its approved revision, else its
 * latest): violations and the worst one, in the words of the diagram.
 */
async function templateRisk(db: Conn, studyId: string, approvedRevision: number | null) {
  const rev = approvedRevision !== null ? await getRevision(db, studyId, approvedRevision).catch(() => null) : null;
  const latest = rev ?? (await latestRevision(db, studyId));
  return latest ? revisionRisk(latest.number, latest.summary as ResultsSummary, (latest.content as StudyContent).circuit) : null;
}

/** Names of users by id (for reviewer lists). */
async function userRefs(db: Conn, ids: string[]): Promise<{ id: string; name: string }[]> {
  if (ids.length === 0) return [];
  const rows = await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids));
  const byId = new Map(rows.map((r) => [r.id, r]));
  return ids.map((id) => byId.get(id)).filter((r): r is { id: string; name: string } => r !== undefined);
}

/** One study of the actor's team, or 404. */
export async function getStudy(db: Conn, actor: Actor, id: string): Promise<StudyDetail> {
  if (!isUuid(id)) throw notFound();
  const [row] = await db
    .select({
      ...summaryColumns,
      content: studies.content,
      sourceId: source.id,
      sourceName: source.name,
      clonedFromRevision: studies.clonedFromRevision,
      reviewRequestedBy: studies.reviewRequestedBy,
      reviewers: studies.reviewers,
      reviewRevision: studies.reviewRevision,
    })
    .from(studies)
    .innerJoin(createdByUser, eq(createdByUser.id, studies.createdBy))
    .innerJoin(updatedByUser, eq(updatedByUser.id, studies.updatedBy))
    .leftJoin(source, and(eq(source.id, studies.clonedFrom), eq(source.teamId, studies.teamId)))
    .where(visible(actor, id))
    .limit(1);
  if (!row) throw notFound();
  let review: StudyDetail['review'] = null;
  if (row.reviewRequestedBy && row.reviewRevision !== null) {
    const [requestedBy] = await userRefs(db, [row.reviewRequestedBy]);
    review = { requestedBy: requestedBy ?? { id: row.reviewRequestedBy, name: '(removed)' }, reviewers: await userRefs(db, row.reviewers), revision: row.reviewRevision };
  }
  return {
    ...toSummary(row),
    content: row.content as StudyContent,
    clonedFrom: row.sourceId && row.sourceName !== null ? { id: row.sourceId, name: row.sourceName } : null,
    clonedFromRevision: row.clonedFromRevision,
    revision: row.revision ?? null,
    review,
    approvedRevision: row.approvedRevision,
    ...(row.isTemplate ? { risk: await templateRisk(db, row.id, row.approvedRevision) } : {}),
  };
}

/** Inserts a study with revision 1 (inside the caller's transaction) and records it. */
async function insertStudy(
  tx: Conn,
  actor: Actor,
  v: { name: string; description: string; content: StudyContent; clonedFrom?: string; clonedFromRevision?: number; message: string; summary?: ResultsSummary },
): Promise<CreatedStudy> {
  const [row] = await tx
    .insert(studies)
    .values({
      teamId: actor.teamId,
      name: v.name,
      description: v.description,
      content: v.content,
      clonedFrom: v.clonedFrom ?? null,
      clonedFromRevision: v.clonedFromRevision ?? null,
      createdBy: actor.userId,
      updatedBy: actor.userId,
    })
    .returning({ id: studies.id, version: studies.version });
  await appendRevision(tx, { studyId: row.id, teamId: actor.teamId, authorId: actor.userId, content: v.content, message: v.message, summary: v.summary });
  return row;
}

/** Creates a study (empty 60 Hz circuit when no content is given) with its first revision. */
export async function createStudy(db: Db, actor: Actor, input: CreateStudyRequest): Promise<CreatedStudy> {
  const content = input.content ?? emptyStudyContent();
  const summary = await checkContent(content);
  return db.transaction(async (tx) => {
    const row = await insertStudy(tx, actor, { name: input.name, description: input.description ?? '', content, message: 'Created', summary });
    await recordAudit(tx, { teamId: actor.teamId, actorId: actor.userId, action: 'study.create', studyId: row.id, detail: { name: input.name } });
    return row;
  });
}

/**
 * Creates a study from an imported file, read and checked by the caller off the request thread
 * (server/work/import-file.ts), with its first revision: the content arrives as JSON text and is
 * stored as it is, the revision copying it inside the database.
 */
export async function createImportedStudy(
  db: Db,
  actor: Actor,
  v: { name: string; description: string; contentJson: string; format: string; summaryJson: string; summaryOk: boolean },
): Promise<CreatedStudy> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(studies)
      .values({
        teamId: actor.teamId,
        name: v.name,
        description: v.description,
        content: sql`${v.contentJson}::jsonb`,
        createdBy: actor.userId,
        updatedBy: actor.userId,
      })
      .returning({ id: studies.id, version: studies.version });
    await appendRevisionOfStoredContent(tx, { studyId: row.id, teamId: actor.teamId, authorId: actor.userId, message: `Imported from a ${v.format} file`, summaryJson: v.summaryJson, summaryOk: v.summaryOk });
    await recordAudit(tx, { teamId: actor.teamId, actorId: actor.userId, action: 'study.import', studyId: row.id, detail: { name: v.name, format: v.format } });
    return row;
  });
}

/** An edit: the contract's PATCH fields plus, for revisions, the message and the restored revision. */
export interface StudyEdit extends UpdateStudyRequest {
  restoredFrom?: number;
  /** Refuse (409) when the content equals the latest revision (POST /revisions, restore). */
  requireChange?: boolean;
}

/**
 * Applies an edit made on `input.version`, in one transaction. If someone saved in between,
 * nothing is written and 409 `version-conflict` carries the current study, so the client can merge
 * instead of overwrite. Content that differs from the latest revision makes a new revision and
 * returns a reviewed or approved study to draft (the approval stays on record as a `reset` event);
 * an edited template stops being one, since templates are always approved.
 */
export async function applyEdit(db: Db, actor: Actor, id: string, input: StudyEdit): Promise<{ study: StudyDetail; revision: RevisionSummary | null }> {
  if (!isUuid(id)) throw notFound();
  const summary = input.content ? await checkContent(input.content) : undefined;
  const made = await db.transaction(async (tx) => {
    const [before] = await tx.select().from(studies).where(visible(actor, id)).limit(1);
    if (!before) throw notFound();
    let changed = false;
    let latestNumber: number | null = null;
    if (input.content !== undefined) {
      const latest = await ensureRevision(tx, before);
      latestNumber = latest.number;
      changed = !sameContent(latest.content, input.content);
    }
    const changes: Partial<typeof studies.$inferInsert> = {};
    if (input.name !== undefined) changes.name = input.name;
    if (input.description !== undefined) changes.description = input.description;
    if (input.content !== undefined) changes.content = input.content;
    const reset = changed && before.status !== 'draft';
    if (reset) {
      changes.status = 'draft';
      changes.approvedRevision = null;
    }
    let isTemplate = before.isTemplate;
    if (input.isTemplate !== undefined) isTemplate = input.isTemplate;
    else if (changed && before.isTemplate) isTemplate = false;
    if (isTemplate !== before.isTemplate) changes.isTemplate = isTemplate;

    const updated = await tx
      .update(studies)
      .set({ ...changes, version: sql`${studies.version} + 1`, updatedBy: actor.userId, updatedAt: new Date() })
      .where(and(visible(actor, id), eq(studies.version, input.version)))
      .returning({ id: studies.id });
    if (updated.length === 0) {
      const current = await getStudy(tx, actor, id);
      throw new AppError(
        409,
        'version-conflict',
        `This study was changed by ${current.updatedBy.name} since you opened it; nothing of yours was saved.`,
        { body: { current } },
      );
    }
    if (input.requireChange && !changed) {
      throw new AppError(409, 'conflict', `Nothing changed since revision ${latestNumber}; no revision was made.`);
    }
    if (input.isTemplate === true && !before.isTemplate && (before.status !== 'approved' || changed)) {
      throw new AppError(
        409,
        'conflict',
        changed
          ? 'A template must be approved; this save changes the content, so mark it as a template after it is approved again.'
          : `Only an approved study can be marked as a template (this one is ${before.status}).`,
      );
    }

    let revisionNumber: number | null = null;
    if (changed && input.content) {
      const rev = await appendRevision(tx, {
        studyId: id,
        teamId: actor.teamId,
        authorId: actor.userId,
        content: input.content,
        message: input.message,
        restoredFrom: input.restoredFrom ?? null,
        summary,
      });
      revisionNumber = rev.number;
    }
    if (reset) {
      const recordRevision = before.approvedRevision ?? before.reviewRevision;
      await tx.insert(reviewEvents).values({
        studyId: id,
        teamId: actor.teamId,
        actorId: actor.userId,
        action: 'reset',
        fromStatus: before.status,
        toStatus: 'draft',
        revision: recordRevision,
        reviewers: before.reviewers,
        message: `Edited in revision ${revisionNumber}; back to draft.`,
      });
      await recordAudit(tx, {
        teamId: actor.teamId,
        actorId: actor.userId,
        action: 'review.reset',
        studyId: id,
        detail: { fromStatus: before.status, approvedRevision: before.approvedRevision, revision: revisionNumber },
      });
    }
    const fields = Object.keys(changes).filter((k) => ['name', 'description', 'content'].includes(k));
    if (fields.length > 0) {
      await recordAudit(tx, { teamId: actor.teamId, actorId: actor.userId, action: 'study.update', studyId: id, detail: { fields, version: input.version + 1 } });
    }
    if (isTemplate !== before.isTemplate) {
      await recordAudit(tx, {
        teamId: actor.teamId,
        actorId: actor.userId,
        action: 'study.template',
        studyId: id,
        detail: { isTemplate, ...(input.isTemplate === undefined ? { reason: 'content edited' } : {}) },
      });
    }
    return revisionNumber;
  });
  const study = await getStudy(db, actor, id);
  let revision: RevisionSummary | null = null;
  if (made !== null) {
    revision = (await listRevisions(db, id)).find((r) => r.number === made) ?? null;
  }
  return { study, revision };
}

/** PATCH /api/studies/:id. */
export async function updateStudy(db: Db, actor: Actor, id: string, input: UpdateStudyRequest): Promise<StudyDetail> {
  return (await applyEdit(db, actor, id, input)).study;
}

/** Soft-deletes a study (and cancels its server sweeps). */
export async function deleteStudy(db: Db, actor: Actor, id: string): Promise<void> {
  if (!isUuid(id)) throw notFound();
  const deleted = await db
    .update(studies)
    .set({ deletedAt: new Date(), updatedBy: actor.userId })
    .where(visible(actor, id))
    .returning({ id: studies.id, name: studies.name });
  if (deleted.length === 0) throw notFound();
  await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: 'study.delete', studyId: id, detail: { name: deleted[0].name } });
  await cancelStudySweeps(db, id);
}

/** "<name> (copy)" within the 200 characters a name may have: the name is shortened (whole characters), never the "(copy)". */
function copyName(name: string): string {
  const suffix = ' (copy)';
  const chars = Array.from(name);
  while (chars.join('').length + suffix.length > 200) chars.pop();
  return `${chars.join('').trimEnd()}${suffix}`;
}

/**
 * Copies a study (how a study is started from a template): circuit, layout and settings become
 * revision 1 of a draft that remembers its source and the source's revision.
 */
export async function cloneStudy(db: Db, actor: Actor, id: string, input: CloneStudyRequest): Promise<CreatedStudy> {
  const from = await getStudy(db, actor, id);
  const name = input.name ?? copyName(from.name);
  return db.transaction(async (tx) => {
    const [raw] = await tx.select().from(studies).where(visible(actor, id)).limit(1);
    if (!raw) throw notFound();
    const sourceRev = await ensureRevision(tx, raw);
    const content = sourceRev.content as StudyContent;
    const row = await insertStudy(tx, actor, {
      name,
      description: from.description,
      content,
      clonedFrom: from.id,
      clonedFromRevision: sourceRev.number,
      summary: sourceRev.summary as ResultsSummary, // same content, same results
      message: `${from.isTemplate ? 'New from template' : 'Copy of'} "${from.name}" revision ${sourceRev.number}`,
    });
    await recordAudit(tx, {
      teamId: actor.teamId,
      actorId: actor.userId,
      action: 'study.clone',
      studyId: row.id,
      detail: { sourceId: from.id, sourceName: from.name, sourceRevision: sourceRev.number, fromTemplate: from.isTemplate },
    });
    return row;
  });
}

/**
 * The templates of the team (approved studies marked as templates), as in `GET /api/studies?template=true`,
 * each with the danger of the revision a new study would copy (its violations and the worst one).
 */
export async function listTemplates(db: Db, actor: Actor): Promise<TemplateListResponse> {
  const rows = await db
    .select(summaryColumns)
    .from(studies)
    .innerJoin(createdByUser, eq(createdByUser.id, studies.createdBy))
    .innerJoin(updatedByUser, eq(updatedByUser.id, studies.updatedBy))
    .where(and(visible(actor), eq(studies.isTemplate, true)))
    .orderBy(asc(sql`lower(${studies.name})`), asc(studies.id))
    .limit(500);
  return { items: await Promise.all(rows.map(async (r) => ({ ...toSummary(r), risk: await templateRisk(db, r.id, r.approvedRevision) }))) };
}
