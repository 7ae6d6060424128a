/**
 * Files attached to a study (PDF, PNG, JPEG, CSV up to 10 MB). The type is read from the content
 * (magic bytes; CSV as UTF-8 text) and must agree with the file name's extension, so a renamed
 * file is refused. Checking four signatures by hand keeps this dependency-free and exact for the
 * four accepted types (file-type would add an ESM-only package for the same four checks).
 * Bytes live in the bucket under `attachments/<id>` (server/storage), metadata in the database.
 */
import path from 'node:path';
import type { Readable } from 'node:stream';
import { and, desc, eq } from 'drizzle-orm';
import { roleAtLeast } from '../../shared/api/common.ts';
import { ATTACHMENT_TYPES, type Attachment, type AttachmentContentType } from '../../shared/api/attachments.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { attachments, users } from '../db/schema.ts';
import { AppError, fieldError, isUuid, notFound } from '../errors.ts';
import { logEvent } from '../log.ts';
import { ObjectStoreError, type ObjectStore } from '../storage/objects.ts';
import { recordAudit } from './audit.ts';
import { getStudy } from './studies.ts';

const TYPE_WORDS: Record<AttachmentContentType, string> = { 'application/pdf': 'PDF', 'image/png': 'PNG', 'image/jpeg': 'JPEG', 'text/csv': 'CSV' };

const startsWith = (b: Buffer, sig: number[]) => b.length >= sig.length && sig.every((x, i) => b[i] === x);

/** The accepted type of `bytes`, from their content, or null. */
export function sniffType(bytes: Buffer): AttachmentContentType | null {
  if (startsWith(bytes, [0x25, 0x50, 0x44, 0x46, 0x2d])) return 'application/pdf'; // "%PDF-" (ISO 32000-1 §7.5.2)
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'image/png'; // PNG signature (RFC 2083 §3.1)
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return 'image/jpeg'; // SOI marker then the next marker (ITU T.81 B.1.1.3)
  // CSV: text. Valid UTF-8, no NUL or other control characters than tab, CR, LF, form feed.
  try {
    const text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    if (/[\u0000-\u0008\u000b\u000e-\u001f\u007f]/.test(text)) return null;
    return 'text/csv';
  } catch {
    return null;
  }
}

/** A safe display name: the last path segment, no control characters (CR, LF, NUL…) or broken Unicode, at most 200 characters. */
export function cleanFileName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? '';
  const clean = base
    .replace(/[\u0000-\u001f\u007f"]|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/g, '')
    .trim()
    .slice(-200)
    .replace(/^[\udc00-\udfff]/, '');
  return clean || 'file';
}

/** The bucket key of an attachment's bytes. */
export function attachmentKey(id: string): string {
  return `attachments/${id}`;
}

/** A store that cannot be reached becomes a 503 that says what happened to the request. */
function unavailable(err: unknown, what: string): never {
  if (err instanceof ObjectStoreError) {
    logEvent('warn', { event: 'object-store-failed', error: err.message });
    throw new AppError(503, 'unavailable', `The file store cannot be reached just now, so ${what}. Try again in a moment.`);
  }
  throw err;
}

type Row = typeof attachments.$inferSelect;

function toAttachment(r: Row, uploaderName: string): Attachment {
  return {
    id: r.id,
    fileName: r.fileName,
    contentType: r.contentType,
    size: r.size,
    uploadedBy: { id: r.uploadedBy, name: uploaderName },
    createdAt: r.createdAt.toISOString(),
  };
}

/** Stores an uploaded file after checking its type against its content. */
export async function addAttachment(db: Db, objects: ObjectStore, actor: Actor, studyId: string, file: { originalname: string; buffer: Buffer } | undefined): Promise<Attachment> {
  await getStudy(db, actor, studyId);
  if (!file) throw fieldError('file', 'Choose a file to attach (form field "file").');
  if (file.buffer.length === 0) throw fieldError('file', 'The file is empty.');
  const fileName = cleanFileName(file.originalname);
  const ext = path.extname(fileName).slice(1).toLowerCase();
  const type = sniffType(file.buffer);
  if (!type) throw new AppError(415, 'unsupported-media-type', 'Only PDF, PNG, JPEG and CSV files can be attached; this file is none of them.');
  if (!(ATTACHMENT_TYPES[type] as readonly string[]).includes(ext)) {
    throw new AppError(
      415,
      'unsupported-media-type',
      `The file's content is ${TYPE_WORDS[type]} but its name ends in ${ext ? `.${ext}` : 'no extension'}; name it .${ATTACHMENT_TYPES[type][0]} or attach the right file.`,
    );
  }
  const [row] = await db
    .insert(attachments)
    .values({ studyId, teamId: actor.teamId, fileName, contentType: type, size: file.buffer.length, uploadedBy: actor.userId })
    .returning();
  try {
    await objects.put(attachmentKey(row.id), file.buffer, type);
  } catch (err) {
    await db.delete(attachments).where(eq(attachments.id, row.id));
    unavailable(err, 'the file was not attached');
  }
  await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: 'attachment.upload', studyId, detail: { attachmentId: row.id, fileName, contentType: type, size: row.size } });
  return toAttachment(row, actor.name);
}

/** The study's attachments, newest first. */
export async function listAttachments(db: Db, actor: Actor, studyId: string): Promise<{ items: Attachment[] }> {
  await getStudy(db, actor, studyId);
  const rows = await db
    .select({ a: attachments, name: users.name })
    .from(attachments)
    .innerJoin(users, eq(users.id, attachments.uploadedBy))
    .where(and(eq(attachments.studyId, studyId), eq(attachments.teamId, actor.teamId)))
    .orderBy(desc(attachments.createdAt), desc(attachments.id));
  return { items: rows.map((r) => toAttachment(r.a, r.name)) };
}

async function oneAttachment(db: Db, actor: Actor, studyId: string, id: string): Promise<Row> {
  await getStudy(db, actor, studyId);
  if (!isUuid(id)) throw notFound('Attachment');
  const [row] = await db
    .select()
    .from(attachments)
    .where(and(eq(attachments.id, id), eq(attachments.studyId, studyId), eq(attachments.teamId, actor.teamId)))
    .limit(1);
  if (!row) throw notFound('Attachment');
  return row;
}

/** The metadata of one attachment and its bytes as a stream from the bucket. */
export async function readAttachment(db: Db, objects: ObjectStore, actor: Actor, studyId: string, id: string): Promise<{ row: Row; body: Readable }> {
  const row = await oneAttachment(db, actor, studyId, id);
  const stored = await objects.get(attachmentKey(row.id)).catch((err: unknown) => unavailable(err, 'the file cannot be downloaded'));
  if (!stored) throw new AppError(404, 'not-found', 'The file of this attachment is missing from the file store.');
  return { row, body: stored.body };
}

/** Removes an attachment (its uploader, or engineer and above). */
export async function deleteAttachment(db: Db, objects: ObjectStore, actor: Actor, studyId: string, id: string): Promise<void> {
  const row = await oneAttachment(db, actor, studyId, id);
  if (row.uploadedBy !== actor.userId && !roleAtLeast(actor.role, 'engineer')) {
    throw new AppError(403, 'forbidden', 'Only whoever attached this file, an engineer or an owner can remove it.');
  }
  await db.delete(attachments).where(eq(attachments.id, row.id));
  // The record is gone either way; bytes the store could not remove now are only unreachable.
  await objects.delete(attachmentKey(row.id)).catch((err: unknown) => logEvent('warn', { event: 'attachment-object-not-removed', attachmentId: row.id, error: err instanceof Error ? err.message : String(err) }));
  await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: 'attachment.delete', studyId, detail: { attachmentId: row.id, fileName: row.fileName } });
}
