/** The "Bus voltages" table: line-to-neutral and line-to-line phasors, neutral shift, unbalance, flags per bus. */
import { useMemo } from 'react';
import type { BusResult, CircuitResult, Phasor } from '../../../../shared/engine/index.ts';
import { formatAngle, formatMagnitude, formatValue } from './format.ts';
import { FlagMark } from './flag-mark.tsx';
import { worstFlag } from './overlays.ts';
import { lnLabel, phaseStyle, type WiringStandard } from './phase-style.ts';
import { ResultsTable, type ResultColumn } from './results-table.tsx';

const LN_ORDER = ['a', 'b', 'c', '1', '2'];
const LL_ORDER = ['ab', 'bc', 'ca', '12'];

/** "141.6∠−2.1°" (the unit is in the header); "—" when absent. */
export function PhasorCell({ p }: { p?: Phasor }) {
  if (!p) return <span className="text-ink-faint">—</span>;
  if (p.mag < 1e-6) return <span>0</span>;
  return (
    <span>
      {formatMagnitude(p.mag)}
      <span className="text-ink-muted">∠{formatAngle(p.angleDeg)}</span>
    </span>
  );
}

function phasorColumn<Row extends object>(id: string, header: string, unit: string, get: (r: Row) => Phasor | undefined): ResultColumn<Row> {
  return {
    id,
    header: `${header} (${unit}∠°)`,
    numeric: true,
    sortValue: (r) => get(r)?.mag,
    render: (r) => <PhasorCell p={get(r)} />,
    tsvHeader: [`${header} |${unit}| (${unit})`, `${header} angle (°)`],
    tsv: (r) => {
      const p = get(r);
      return p ? [String(p.mag), String(p.angleDeg)] : ['', ''];
    },
  };
}

/** Neutral shift as shown in the table: "56.8 V (47.3 %)". */
export function formatNeutralShift(b: BusResult): string {
  if (!b.neutralToEarth) return '—';
  const pct = b.neutralShiftPercent === undefined ? '' : ` (${b.neutralShiftPercent.toFixed(1)} %)`;
  return `${formatMagnitude(b.neutralToEarth.mag)} V${pct}`;
}

function busColumns(result: CircuitResult, standard: WiringStandard): ResultColumn<BusResult>[] {
  const lnPresent = LN_ORDER.filter((p) => result.buses.some((b) => b.lineToNeutral[p]));
  const llPresent = LL_ORDER.filter((p) => result.buses.some((b) => b.lineToLine[p]));
  const flagsOf = (b: BusResult) => result.flags.filter((f) => f.bus === b.bus && !f.elementId);
  const pct = (id: string, header: string, get: (b: BusResult) => number | undefined): ResultColumn<BusResult> => ({
    id,
    header: `${header} (%)`,
    numeric: true,
    sortValue: get,
    render: (b) => formatValue(get(b), '%', 2),
    tsvHeader: [`${header} (%)`],
    tsv: (b) => [get(b)?.toString() ?? ''],
  });
  return [
    {
      id: 'bus',
      header: 'Bus',
      sortValue: (b) => b.bus,
      render: (b) => (
        <span className="font-semibold">
          {b.bus}
          {b.floating ? <span className="ml-1 font-normal text-caution">(floating)</span> : null}
        </span>
      ),
      tsvHeader: ['Bus'],
      tsv: (b) => [b.bus],
    },
    {
      id: 'nominal',
      header: 'Nominal V_LN (V)',
      numeric: true,
      sortValue: (b) => b.nominalVLN,
      render: (b) => formatValue(b.nominalVLN, 'V'),
      tsvHeader: ['Nominal V_LN (V)'],
      tsv: (b) => [b.nominalVLN?.toString() ?? ''],
    },
    // A bus with no neutral reports phase-to-earth in lineToNeutral; the Bus column's reference note says so in the phasor view.
    ...lnPresent.map((p) => phasorColumn<BusResult>(`ln-${p}`, lnLabel(p, standard), 'V', (b) => b.lineToNeutral[p])),
    ...llPresent.map((p) => phasorColumn<BusResult>(`ll-${p}`, phaseStyle(p, standard).label, 'V', (b) => b.lineToLine[p])),
    {
      id: 'shift',
      header: 'Neutral shift (V, %)',
      numeric: true,
      sortValue: (b) => b.neutralToEarth?.mag,
      render: (b) => <span data-testid={`neutral-shift-${b.bus}`}>{formatNeutralShift(b)}</span>,
      tsvHeader: ['Neutral shift (V)', 'Neutral shift (% of nominal V_LN)'],
      tsv: (b) => [b.neutralToEarth?.mag.toString() ?? '', b.neutralShiftPercent?.toString() ?? ''],
    },
    pct('iec', 'IEC V2/V1', (b) => b.iecUnbalancePercent),
    pct('nema', 'NEMA', (b) => b.nemaUnbalancePercent),
    pct('ieee', 'IEEE', (b) => b.ieeeUnbalancePercent),
    {
      id: 'flags',
      header: 'Flags',
      sortValue: (b) => flagsOf(b).length,
      render: (b) => <FlagMark flags={flagsOf(b)} />,
      tsvHeader: ['Flags'],
      tsv: (b) => [flagsOf(b).map((f) => f.message).join('; ')],
    },
  ];
}

/** Bus voltages of a result; `selectedBus` highlights the canvas selection. */
export function BusTable({ result, standard, selectedBus, onSelectBus }: { result: CircuitResult; standard: WiringStandard; selectedBus?: string | null; onSelectBus?: (bus: string) => void }) {
  const columns = useMemo(() => busColumns(result, standard), [result, standard]);
  return (
    <div>
      <ResultsTable label="Bus voltages" rows={result.buses} columns={columns} rowId={(b) => b.bus} selectedId={selectedBus} onRowSelect={onSelectBus} />
      <p className="mt-1 text-[11px] text-ink-muted">
        RMS, magnitude∠degrees. Line-to-neutral columns are to earth at a bus without a neutral. Neutral shift: neutral-to-earth voltage, V and % of nominal V_LN.
        Unbalance: IEC |V2|/|V1|; NEMA line-voltage max deviation from average; IEEE phase-voltage (line-to-neutral) max deviation.
      </p>
    </div>
  );
}

