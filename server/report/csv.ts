/** The CSV of one results table of a revision (or case): solved here, written by shared/report. */
import { EngineError, solveCircuit } from '../../shared/engine/index.ts';
import { reportedCircuit } from '../../shared/report/document.ts';
import { circuitNames } from '../../shared/review/user-names.ts';
import { toCsv } from '../../shared/report/csv.ts';
import { readPerUnitSettings, type ResultUnits } from '../../shared/report/per-unit.ts';
import { basesWords, csvTable, tableContext, type CsvTable } from '../../shared/report/tables.ts';

export interface CsvInput {
  content: { circuit: unknown; layout?: unknown };
  caseId?: string;
  units: ResultUnits;
  table: CsvTable;
}

/** The CSV text, or why the circuit does not solve (in the words of the diagram). */
export function resultsCsv(input: CsvInput): { ok: true; csv: string } | { ok: false; message: string } {
  const { circuit } = reportedCircuit(input.content.circuit, input.caseId);
  try {
    const result = solveCircuit(circuit);
    const ctx = tableContext(circuit, result, input.units, readPerUnitSettings(input.content.layout));
    return { ok: true, csv: toCsv(csvTable(ctx, input.table), input.units === 'pu' ? basesWords(ctx) : undefined) };
  } catch (err) {
    if (!(err instanceof EngineError)) throw err;
    return { ok: false, message: circuitNames(circuit).text(err.message) };
  }
}
