/**
 * Reading an uploaded study file, from its text to what the database stores: JSON parse, the input
 * boundary's checks (input-guard.ts: storable text, depth), the file's schema, the engine's check
 * of the circuit and its solve for the first revision's summary, and the content serialised again
 * as JSON for the insert. All of it is CPU work on up to 2 MB (a parse, a walk, a solve and a
 * stringify of tens of milliseconds each), so the pool runs it off the request thread (pool.ts);
 * the answer is plain data. Every problem reads like a form error ("element LOAD3: every phase ›
 * P (kW) must be a number", shared/review/circuit-issues.ts), keyed by its path in the file.
 */
import { findJsonProblem } from '../../shared/api/limits.ts';
import type { StudyContent } from '../../shared/api/studies.ts';
import { studyFileSchema } from '../../shared/api/transfer.ts';
import { circuitIssueFields, circuitIssueWords } from '../../shared/review/circuit-issues.ts';
import type { ResultsSummary } from '../../shared/review/summary.ts';
import { zodFields } from '../error-handler.ts';
import { prepare } from './tasks.ts';

/** What a file holds, ready to store; or the 400 to answer (message and fields). */
export type StudyFileReading =
  | { ok: false; message: string; fields: Record<string, string> }
  | { ok: true; format: 'wyeward-study' | 'wyeward-circuit'; name: string; description: string; summaryOk: boolean; summaryJson: string; contentJson: string };

/**
 * The pool's job for a file (worker.ts): its bytes as received (UTF-8; moved to the thread, not
 * copied), or its text when the body arrived in another character set.
 */
export interface ImportTask {
  kind: 'import';
  body: Uint8Array | string;
}

/** The text of an uploaded body: bytes are read as UTF-8 (a byte-order mark dropped, bad sequences as U+FFFD, as body-parser reads text). */
export function bodyText(body: Uint8Array | string | undefined): string | undefined {
  if (body === undefined || typeof body === 'string') return body;
  return new TextDecoder('utf-8').decode(body);
}

type Refusal = Extract<StudyFileReading, { ok: false }>;

/** Every problem in words (`fields`: path in the file → sentence); the message names the first. */
function invalid(fields: Record<string, string>): Refusal {
  const list = Object.values(fields);
  const more = list.length > 1 ? ` (and ${list.length - 1} more problem${list.length > 2 ? 's' : ''})` : '';
  return { ok: false, message: list.length > 0 ? `The file is not valid: ${list[0]}${more}.` : 'The file is not valid.', fields };
}

/** The engine's check of a circuit, field paths prefixed by where it sits in the file; its summary when valid. */
function checkCircuit(circuit: unknown, prefix: string): { ok: true; summary: ResultsSummary } | Refusal {
  const prepared = prepare(circuit);
  if (prepared.ok) return prepared;
  const issues = prepared.issues.length > 0 ? prepared.issues : [{ path: '(root)', message: prepared.message }];
  const fields = circuitIssueFields(circuit, issues.map((i) => ({ ...i, path: i.path === '(root)' ? '' : i.path })), prefix ? `${prefix}.` : '');
  if (fields[prefix ? `${prefix}.` : ''] !== undefined) {
    fields[prefix || '_'] = fields[prefix ? `${prefix}.` : ''];
    delete fields[prefix ? `${prefix}.` : ''];
  }
  return invalid(fields);
}

/**
 * Reads an uploaded file (the request body as sent: its bytes, or its text; undefined when it was
 * not JSON). The summary and the content come back as JSON text, ready for the insert: the request
 * thread neither serialises nor copies them as objects (a 2 MB file's summary is ~1.7 MB of JSON).
 */
export function readStudyFile(input: Uint8Array | string | undefined): StudyFileReading {
  const text = bodyText(input);
  let body: unknown;
  try {
    body = text === undefined || text.trim() === '' ? undefined : JSON.parse(text);
  } catch {
    return { ok: false, message: 'The request body is not valid JSON.', fields: { _: 'Malformed JSON' } };
  }
  // The input boundary's check, as guardBody makes it on every other JSON body.
  const problem = body === undefined ? null : findJsonProblem(body);
  if (problem) {
    const { path, message } = problem;
    return { ok: false, message: path === '_' ? `The request body: ${message.toLowerCase()}.` : `${path}: ${message}.`, fields: { [path]: message } };
  }
  if (typeof body !== 'object' || body === null || Array.isArray(body)) return invalid({ _: 'Send the file as a JSON object.' });
  if ((body as { format?: unknown }).format === 'wyeward-circuit') {
    const checked = checkCircuit(body, '');
    if (!checked.ok) return checked;
    const circuit = body as StudyContent['circuit'] & { name?: unknown; description?: unknown };
    const name = typeof circuit.name === 'string' && circuit.name.trim() ? circuit.name.trim().slice(0, 200) : 'Imported circuit';
    const description = typeof circuit.description === 'string' ? circuit.description.slice(0, 5000) : '';
    const content: StudyContent = { circuit };
    return { ok: true, format: 'wyeward-circuit', name, description, summaryOk: checked.summary.ok, summaryJson: JSON.stringify(checked.summary), contentJson: JSON.stringify(content) };
  }
  const parsed = studyFileSchema.safeParse(body);
  if (!parsed.success) {
    const circuit = (body as { circuit?: unknown }).circuit;
    const fields: Record<string, string> = {};
    for (const [path, message] of Object.entries(zodFields(parsed.error))) {
      fields[path] = path.startsWith('circuit.') ? circuitIssueWords(circuit, { path: path.slice('circuit.'.length), message }) : circuitIssueWords(body, { path, message });
    }
    return invalid(fields);
  }
  const f = parsed.data;
  const checked = checkCircuit(f.circuit, 'circuit');
  if (!checked.ok) return checked;
  const content: StudyContent = {
    circuit: f.circuit,
    ...(f.layout !== undefined ? { layout: f.layout } : {}),
    ...(f.settings !== undefined ? { settings: f.settings } : {}),
  };
  return { ok: true, format: 'wyeward-study', name: f.name, description: f.description ?? '', summaryOk: checked.summary.ok, summaryJson: JSON.stringify(checked.summary), contentJson: JSON.stringify(content) };
}
