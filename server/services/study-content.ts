/**
 * Validation of a study's circuit beyond the API envelope (format, version, frequencyHz,
 * elements[]): the whole circuit must pass the engine's own parser, so a saved study always
 * opens in the engine. The circuit is stored as the client sent it (defaults are not baked in).
 */
import { InvalidCircuitError, parseCircuit } from '../../shared/engine/index.ts';
import type { StudyContent } from '../../shared/api/studies.ts';
import { AppError } from '../errors.ts';

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
