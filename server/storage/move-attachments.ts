/**
 * Attachments written by earlier versions as files under DATA_DIR/attachments/<id> move into the
 * bucket at start: each file whose attachment still exists is stored under its key with its
 * recorded type, then the file is removed (files of deleted attachments are removed too); the
 * folder goes once empty. A start interrupted half-way moves the rest at the next one.
 */
import { readFile, readdir, rm, rmdir } from 'node:fs/promises';
import path from 'node:path';
import { inArray } from 'drizzle-orm';
import type { Db } from '../db/index.ts';
import { attachments } from '../db/schema.ts';
import { isUuid } from '../errors.ts';
import { attachmentKey } from '../services/attachments.ts';
import type { ObjectStore } from './objects.ts';

/** Moves what lies under `dataDir`/attachments into `objects`; returns how many files moved. */
export async function moveLocalAttachments(db: Db, objects: ObjectStore, dataDir: string): Promise<{ moved: number; dropped: number }> {
  const dir = path.join(dataDir, 'attachments');
  let names: string[];
  try {
    names = await readdir(dir);
  } catch {
    return { moved: 0, dropped: 0 };
  }
  const ids = names.filter(isUuid);
  let moved = 0;
  let dropped = 0;
  for (let i = 0; i < ids.length; i += 100) {
    const batch = ids.slice(i, i + 100);
    const rows = await db.select({ id: attachments.id, contentType: attachments.contentType }).from(attachments).where(inArray(attachments.id, batch));
    const typeOf = new Map(rows.map((r) => [r.id, r.contentType]));
    for (const id of batch) {
      const file = path.join(dir, id);
      const type = typeOf.get(id);
      if (type) {
        await objects.put(attachmentKey(id), await readFile(file), type);
        moved++;
      } else {
        dropped++;
      }
      await rm(file, { force: true });
    }
  }
  await rmdir(dir).catch(() => {}); // left in place if anything else is in it
  return { moved, dropped };
}
