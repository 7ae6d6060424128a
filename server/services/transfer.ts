/**
 * Export of a study as a file and import of one. The export (`wyeward-study`) wraps the circuit
 * (a `wyeward-circuit` object that the engine and CLI read as is) with its layout and settings.
 * Import accepts that, or a bare `wyeward-circuit` file (read by server/work/import-file.ts).
 */
import type { CreatedStudy } from '../../shared/api/studies.ts';
import type { StudyFile } from '../../shared/api/transfer.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { AppError } from '../errors.ts';
import { recordAudit } from './audit.ts';
import { createImportedStudy, getStudy } from './studies.ts';
import { work } from '../work/index.ts';

/** The export file of a study and a download name for it. */
export async function exportStudy(db: Db, actor: Actor, id: string): Promise<{ file: StudyFile; fileName: string }> {
  const s = await getStudy(db, actor, id);
  const file: StudyFile = {
    format: 'wyeward-study',
    version: 1,
    name: s.name,
    description: s.description,
    exportedAt: new Date().toISOString(),
    revision: s.revision ?? null,
    circuit: s.content.circuit,
    ...(s.content.layout !== undefined ? { layout: s.content.layout } : {}),
    ...(s.content.settings !== undefined ? { settings: s.content.settings } : {}),
  };
  await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: 'study.export', studyId: id, detail: { revision: s.revision ?? null } });
  const slug = s.name.normalize('NFKD').replace(/[^\w-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 80) || 'study';
  return { file, fileName: `${slug}.wyeward.json` };
}

/**
 * Creates a study from an uploaded file (the request body as sent: its UTF-8 bytes, which are moved
 * to the work pool, or its text; undefined when it was not JSON). Reading and checking it (decode,
 * parse, input boundary, schema, the engine's check and solve, the JSON text to store) runs in the
 * work pool; a problem is a 400 listing every field by its path in the file.
 */
export async function importStudy(db: Db, actor: Actor, body: Uint8Array | string | undefined, nameOverride?: string): Promise<CreatedStudy> {
  const file = await work().readStudyFile(body);
  if (!file.ok) throw new AppError(400, 'validation', file.message, { fields: file.fields });
  return createImportedStudy(db, actor, {
    name: nameOverride ?? file.name,
    description: file.description,
    contentJson: file.contentJson,
    format: file.format,
    summaryJson: file.summaryJson,
    summaryOk: file.summaryOk,
  });
}
