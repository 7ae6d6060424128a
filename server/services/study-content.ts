/**
 * Validation of a study's circuit beyond the API envelope (format, version, frequencyHz, elements[]).
 * TODO(engine): once shared/engine/index.ts exports `circuitSchema`, validate `content.circuit`
 * with it here and report its issues as `fields` under `content.circuit.…`.
 */
import type { StudyContent } from '../../shared/api/studies.ts';

/** Throws a 400 validation error when the circuit is not acceptable. */
export function validateCircuit(_content: StudyContent): void {
  // The envelope is already checked by studyContentSchema in the route.
}
