/** Studies: team-scoped, soft-deleted, optimistically versioned. A study of another team is "not found". */
import { and, asc, count, desc, eq, ilike, isNull, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
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
  type UpdateStudyRequest,
} from '../../shared/api/studies.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { studies, users } from '../db/schema.ts';
import { AppError, isUuid, notFound } from '../errors.ts';
import { recordAudit } from './audit.ts';
import { validateCircuit } from './study-content.ts';

const createdByUser = alias(users, 'created_by_user');
const updatedByUser = alias(users, 'updated_by_user');
const source = alias(studies, 'source_study');

const elementCount = sql<number>`case when jsonb_typeof(${studies.content}->'circuit'->'elements') = 'array'
  then jsonb_array_length(${studies.content}->'circuit'->'elements') else 0 end`.mapWith(Number);

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
  };
}

/** The live (not deleted) studies of the actor's team, as a WHERE clause. */
function visible(actor: Actor, id?: string): SQL {
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
  return { items: rows.map(toSummary), total, page: q.page, pageSize: q.pageSize };
}

/** One study of the actor's team, or 404. */
export async function getStudy(db: Db, actor: Actor, id: string): Promise<StudyDetail> {
  if (!isUuid(id)) throw notFound();
  const [row] = await db
    .select({ ...summaryColumns, content: studies.content, sourceId: source.id, sourceName: source.name })
    .from(studies)
    .innerJoin(createdByUser, eq(createdByUser.id, studies.createdBy))
    .innerJoin(updatedByUser, eq(updatedByUser.id, studies.updatedBy))
    .leftJoin(source, and(eq(source.id, studies.clonedFrom), eq(source.teamId, studies.teamId)))
    .where(visible(actor, id))
    .limit(1);
  if (!row) throw notFound();
  return {
    ...toSummary(row),
    content: row.content as StudyContent,
    clonedFrom: row.sourceId && row.sourceName !== null ? { id: row.sourceId, name: row.sourceName } : null,
  };
}

/** Creates a study (empty 60 Hz circuit when no content is given). */
export async function createStudy(db: Db, actor: Actor, input: CreateStudyRequest): Promise<CreatedStudy> {
  const content = input.content ?? emptyStudyContent();
  validateCircuit(content);
  const [row] = await db
    .insert(studies)
    .values({
      teamId: actor.teamId,
      name: input.name,
      description: input.description ?? '',
      content,
      createdBy: actor.userId,
      updatedBy: actor.userId,
    })
    .returning({ id: studies.id, version: studies.version });
  await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: 'study.create', studyId: row.id, detail: { name: input.name } });
  return row;
}

/**
 * Applies an edit made on `input.version`. If someone saved in between, nothing is written and
 * 409 `version-conflict` carries the current study, so the client can merge instead of overwrite.
 */
export async function updateStudy(db: Db, actor: Actor, id: string, input: UpdateStudyRequest): Promise<StudyDetail> {
  if (!isUuid(id)) throw notFound();
  if (input.content) validateCircuit(input.content);
  const before = await getStudy(db, actor, id);
  const changes: Partial<typeof studies.$inferInsert> = {};
  if (input.name !== undefined) changes.name = input.name;
  if (input.description !== undefined) changes.description = input.description;
  if (input.content !== undefined) changes.content = input.content;
  if (input.isTemplate !== undefined) changes.isTemplate = input.isTemplate;

  const updated = await db
    .update(studies)
    .set({ ...changes, version: sql`${studies.version} + 1`, updatedBy: actor.userId, updatedAt: new Date() })
    .where(and(visible(actor, id), eq(studies.version, input.version)))
    .returning({ id: studies.id });
  if (updated.length === 0) {
    const current = await getStudy(db, actor, id); // 404 if it was deleted meanwhile
    throw new AppError(
      409,
      'version-conflict',
      `This study was changed by ${current.updatedBy.name} since you opened it (your version ${input.version}, now ${current.version}).`,
      { body: { current } },
    );
  }

  const fields = Object.keys(changes).filter((k) => k !== 'isTemplate');
  if (fields.length > 0) {
    await recordAudit(db, {
      teamId: actor.teamId,
      actorId: actor.userId,
      action: 'study.update',
      studyId: id,
      detail: { fields, version: input.version + 1 },
    });
  }
  if (input.isTemplate !== undefined && input.isTemplate !== before.isTemplate) {
    await recordAudit(db, {
      teamId: actor.teamId,
      actorId: actor.userId,
      action: 'study.template',
      studyId: id,
      detail: { isTemplate: input.isTemplate },
    });
  }
  return getStudy(db, actor, id);
}

/** Soft-deletes a study. */
export async function deleteStudy(db: Db, actor: Actor, id: string): Promise<void> {
  if (!isUuid(id)) throw notFound();
  const deleted = await db
    .update(studies)
    .set({ deletedAt: new Date(), updatedBy: actor.userId })
    .where(visible(actor, id))
    .returning({ id: studies.id, name: studies.name });
  if (deleted.length === 0) throw notFound();
  await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: 'study.delete', studyId: id, detail: { name: deleted[0].name } });
}

/** Copies a study (how a study is started from a template); the copy is a draft, not a template, and remembers its source. */
export async function cloneStudy(db: Db, actor: Actor, id: string, input: CloneStudyRequest): Promise<CreatedStudy> {
  const from = await getStudy(db, actor, id);
  const name = input.name ?? `${from.name} (copy)`.slice(0, 200);
  const [row] = await db
    .insert(studies)
    .values({
      teamId: actor.teamId,
      name,
      description: from.description,
      content: from.content,
      clonedFrom: from.id,
      createdBy: actor.userId,
      updatedBy: actor.userId,
    })
    .returning({ id: studies.id, version: studies.version });
  await recordAudit(db, {
    teamId: actor.teamId,
    actorId: actor.userId,
    action: 'study.clone',
    studyId: row.id,
    detail: { sourceId: from.id, sourceName: from.name, fromTemplate: from.isTemplate },
  });
  return row;
}
