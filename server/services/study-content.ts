/**
 * Validation of a study's circuit beyond the API envelope (format, version, frequencyHz,
 * elements[]): the whole circuit must pass the engine's own parser, so a saved study always
 * opens in the engine. The circuit is stored as the client sent it (defaults are not baked in).
 */
import { InvalidCircuitError, parseCircuit } from '../../shared/engine/index.ts';
import type { StudyContent } from '../../shared/api/studies.ts';
import type { ResultsSummary } from '../../shared/review/summary.ts';
import { AppError } from '../errors.ts';
import type { CircuitIssue } from '../work/tasks.ts';
import { work } from '../work/index.ts';

/** The 400 validation error whose `fields` name each problem under `prefix` (`content.circuit…`). */
export function circuitError(message: string, issues: CircuitIssue[], prefix = 'content.circuit'): AppError {
  const fields: Record<string, string> = {};
  for (const issue of issues) {
    const key = issue.path === '(root)' ? prefix || '_' : `${prefix ? `${prefix}.` : ''}${issue.path}`;
    fields[key] ??= issue.message;
  }
  return new AppError(400, 'validation', `The circuit is not valid: ${message.replace(/^invalid circuit: /, '')}`, { fields });
}

/**
 * Checks the circuit with the engine's parser and solves it for the summary its revision keeps, off
 * the request thread when it is large (server/work); throws the 400 of `circuitError`.
 */
export async function checkContent(content: StudyContent, prefix = 'content.circuit'): Promise<ResultsSummary> {
  const prepared = await work().prepare(content.circuit);
  if (!prepared.ok) throw circuitError(prepared.message, prepared.issues, prefix);
  return prepared.summary;
}

/** Throws a 400 validation error whose `fields` name each problem under `content.circuit…`. */
export function validateCircuit(content: StudyContent): void {
  try {
    parseCircuit(content.circuit);
  } catch (err) {
    if (!(err instanceof InvalidCircuitError)) throw err;
    const fields: Record<string, string> = {};
    for (const issue of err.issues) {
      const key = issue.path === '(root)' ? 'content.circuit' : `content.circuit.${issue.path}`;
      fields[key] ??= issue.message;
    }
    throw new AppError(400, 'validation', `The circuit is not valid: ${err.message.replace(/^invalid circuit: /, '')}`, { fields });
  }
}
