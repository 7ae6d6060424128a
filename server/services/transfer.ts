/**
 * Export of a study as a file and import of one. The export (`wyeward-study`) wraps the circuit
 * (a `wyeward-circuit` object that the engine and CLI read as is) with its layout and settings.
 * Import accepts that, or a bare `wyeward-circuit` file. Every problem reads like a form error
 * ("element LOAD3: every phase › P (kW) must be a number", shared/review/circuit-issues.ts), keyed
 * by its path in the file.
 */
import { circuitIssueFields, circuitIssueWords } from '../../shared/review/circuit-issues.ts';
import type { ResultsSummary } from '../../shared/review/summary.ts';
import type { CreatedStudy, StudyContent } from '../../shared/api/studies.ts';
import { studyFileSchema, type StudyFile } from '../../shared/api/transfer.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { zodFields } from '../error-handler.ts';
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

/** 400 with every problem in words (`fields`: path in the file → sentence); the message names the first. */
function invalid(fields: Record<string, string>): AppError {
  const list = Object.values(fields);
  const more = list.length > 1 ? ` (and ${list.length - 1} more problem${list.length > 2 ? 's' : ''})` : '';
  return new AppError(400, 'validation', list.length > 0 ? `The file is not valid: ${list[0]}${more}.` : 'The file is not valid.', { fields });
}

/**
 * The engine's own check of a circuit (off the request thread when large, server/work), with field
 * paths prefixed by where the circuit sits in the file; answers the summary of its solve.
 */
async function checkCircuit(circuit: unknown, prefix: string): Promise<ResultsSummary> {
  const prepared = await work().prepare(circuit);
  if (prepared.ok) return prepared.summary;
  const issues = prepared.issues.length > 0 ? prepared.issues : [{ path: '(root)', message: prepared.message }];
  const fields = circuitIssueFields(circuit, issues.map((i) => ({ ...i, path: i.path === '(root)' ? '' : i.path })), prefix ? `${prefix}.` : '');
  if (fields[prefix ? `${prefix}.` : ''] !== undefined) {
    fields[prefix || '_'] = fields[prefix ? `${prefix}.` : ''];
    delete fields[prefix ? `${prefix}.` : ''];
  }
  throw invalid(fields);
}

/** Creates a study from an uploaded file. */
export async function importStudy(db: Db, actor: Actor, body: unknown, nameOverride?: string): Promise<CreatedStudy> {
  if (typeof body !== 'object' || body === null || Array.isArray(body)) throw invalid({ _: 'Send the file as a JSON object.' });
  const format = (body as { format?: unknown }).format;
  if (format === 'wyeward-circuit') {
    const summary = await checkCircuit(body, '');
    const circuit = body as StudyContent['circuit'] & { name?: unknown; description?: unknown };
    const name = nameOverride ?? (typeof circuit.name === 'string' && circuit.name.trim() ? circuit.name.trim().slice(0, 200) : 'Imported circuit');
    const description = typeof circuit.description === 'string' ? circuit.description.slice(0, 5000) : '';
    return createImportedStudy(db, actor, { name, description, content: { circuit }, format: 'wyeward-circuit', summary });
  }
  const parsed = studyFileSchema.safeParse(body);
  if (!parsed.success) {
    const circuit = (body as { circuit?: unknown }).circuit;
    const fields: Record<string, string> = {};
    for (const [path, message] of Object.entries(zodFields(parsed.error))) {
      fields[path] = path.startsWith('circuit.') ? circuitIssueWords(circuit, { path: path.slice('circuit.'.length), message }) : circuitIssueWords(body, { path, message });
    }
    throw invalid(fields);
  }
  const f = parsed.data;
  const summary = await checkCircuit(f.circuit, 'circuit');
  const content: StudyContent = {
    circuit: f.circuit,
    ...(f.layout !== undefined ? { layout: f.layout } : {}),
    ...(f.settings !== undefined ? { settings: f.settings } : {}),
  };
  return createImportedStudy(db, actor, { name: nameOverride ?? f.name, description: f.description ?? '', content, format: 'wyeward-study', summary });
}
