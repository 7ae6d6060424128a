/**
 * Export of a study as a file and import of one. The export (`wyeward-study`) wraps the circuit
 * (a `wyeward-circuit` object that the engine and CLI read as is) with its layout and settings.
 * Import accepts that, or a bare `wyeward-circuit` file, and names every problem by its path in
 * the file.
 */
import { parseCircuit, InvalidCircuitError } from '../../shared/engine/index.ts';
import type { CreatedStudy, StudyContent } from '../../shared/api/studies.ts';
import { studyFileSchema, type StudyFile } from '../../shared/api/transfer.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { zodFields } from '../error-handler.ts';
import { AppError } from '../errors.ts';
import { recordAudit } from './audit.ts';
import { createImportedStudy, getStudy } from './studies.ts';

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

function invalid(fields: Record<string, string>): AppError {
  const [first] = Object.entries(fields);
  return new AppError(400, 'validation', first ? `The file is not valid: ${first[0]}: ${first[1]}` : 'The file is not valid.', { fields });
}

/** The engine's own check of a circuit, with field paths prefixed by where the circuit sits in the file. */
function checkCircuit(circuit: unknown, prefix: string): void {
  try {
    parseCircuit(circuit);
  } catch (err) {
    if (!(err instanceof InvalidCircuitError)) throw err;
    const fields: Record<string, string> = {};
    for (const issue of err.issues) {
      const key = issue.path === '(root)' ? prefix || '_' : `${prefix ? `${prefix}.` : ''}${issue.path}`;
      fields[key] ??= issue.message;
    }
    throw invalid(fields);
  }
}

/** Creates a study from an uploaded file. */
export async function importStudy(db: Db, actor: Actor, body: unknown, nameOverride?: string): Promise<CreatedStudy> {
  if (typeof body !== 'object' || body === null || Array.isArray(body)) throw invalid({ _: 'Send the file as a JSON object.' });
  const format = (body as { format?: unknown }).format;
  if (format === 'wyeward-circuit') {
    checkCircuit(body, '');
    const circuit = body as StudyContent['circuit'] & { name?: unknown; description?: unknown };
    const name = nameOverride ?? (typeof circuit.name === 'string' && circuit.name.trim() ? circuit.name.trim().slice(0, 200) : 'Imported circuit');
    const description = typeof circuit.description === 'string' ? circuit.description.slice(0, 5000) : '';
    return createImportedStudy(db, actor, { name, description, content: { circuit }, format: 'wyeward-circuit' });
  }
  const parsed = studyFileSchema.safeParse(body);
  if (!parsed.success) throw invalid(zodFields(parsed.error));
  const f = parsed.data;
  checkCircuit(f.circuit, 'circuit');
  const content: StudyContent = {
    circuit: f.circuit,
    ...(f.layout !== undefined ? { layout: f.layout } : {}),
    ...(f.settings !== undefined ? { settings: f.settings } : {}),
  };
  return createImportedStudy(db, actor, { name: nameOverride ?? f.name, description: f.description ?? '', content, format: 'wyeward-study' });
}
