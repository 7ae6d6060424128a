/** The "Bus voltages" table: line-to-neutral and line-to-line phasors, neutral shift, unbalance, flags per bus. */
import { useMemo, useState } from 'react';
import { formatPu } from '../../../../shared/report/format.ts';
import { busBase, readPerUnitSettings, type PerUnitSettings, type ResultUnits } from '../../../../shared/report/per-unit.ts';
import type { BusResult, CircuitResult, Phasor } from '../../../../shared/engine/index.ts';
import { formatAngle, formatMagnitude, formatValue } from './format.ts';
import { FlagMark } from './flag-mark.tsx';
import { worstFlag } from './overlays.ts';
import { lnLabel, phaseStyle, type WiringStandard } from './phase-style.ts';
import { ResultsTable, type ResultColumn } from './results-table.tsx';
import { UnitsSwitch } from './units-switch.tsx';

const LN_ORDER = ['a', 'b', 'c', '1', '2'];
const LL_ORDER = ['ab', 'bc', 'ca', '12'];

/** "141.6∠−2.1°" (the unit is in the header); with `base`, the magnitude in per unit of it ("1.179∠23.1°"); "—" when absent. */
export function PhasorCell({ p, base }: { p?: Phasor; base?: number }) {
  if (!p) return <span className="text-ink-faint">—</span>;
  if (p.mag < 1e-6) return <span>0</span>;
  return (
    <span>
      {base ? formatPu(p.mag / base) : formatMagnitude(p.mag)}
      <span className="text-ink-muted">∠{formatAngle(p.angleDeg)}</span>
    </span>
  );
}

/** A phasor column; with `base` (per row), magnitudes in per unit of it. */
export function phasorColumn<Row extends object>(id: string, header: string, unit: string, get: (r: Row) => Phasor | undefined, base?: (r: Row) => number | undefined): ResultColumn<Row> {
  const shown = (r: Row) => {
    const p = get(r);
    const b = base?.(r);
    return p === undefined ? undefined : base ? (b ? p.mag / b : undefined) : p.mag;
  };
  return {
    id,
    header: `${header} (${unit}∠°)`,
    numeric: true,
    sortValue: (r) => shown(r),
    render: (r) => (base && !base(r) ? <span className="text-ink-faint">—</span> : <PhasorCell p={get(r)} base={base?.(r)} />),
    tsvHeader: [`${header} |${unit}| (${unit})`, `${header} angle (°)`],
    tsv: (r) => {
      const p = get(r);
      const m = shown(r);
      return p && m !== undefined ? [String(m), String(p.angleDeg)] : ['', ''];
    },
  };
}

/** Neutral shift as shown in the table: "56.8 V (47.3 %)". */
export function formatNeutralShift(b: BusResult): string {
  if (!b.neutralToEarth) return '—';
  const pct = b.neutralShiftPercent === undefined ? '' : ` (${b.neutralShiftPercent.toFixed(1)} %)`;
  return `${formatMagnitude(b.neutralToEarth.mag)} V${pct}`;
}

function busColumns(result: CircuitResult, standard: WiringStandard, units: ResultUnits, perUnit: PerUnitSettings): ResultColumn<BusResult>[] {
  const pu = units === 'pu';
  const lnBase = pu ? (b: BusResult) => busBase(perUnit, b)?.vLN : undefined;
  const llBase = pu ? (b: BusResult) => busBase(perUnit, b)?.vLL : undefined;
  const u = pu ? 'pu' : 'V';
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
    ...lnPresent.map((p) => phasorColumn<BusResult>(`ln-${p}`, lnLabel(p, standard), u, (b) => b.lineToNeutral[p], lnBase)),
    ...llPresent.map((p) => phasorColumn<BusResult>(`ll-${p}`, phaseStyle(p, standard).label, u, (b) => b.lineToLine[p], llBase)),
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

/**
 * Bus voltages of a result; `selectedBus` highlights the canvas selection. A V/pu switch shows the
 * voltage magnitudes in per unit of each bus's base (the study's bases, `perUnit`, by default the
 * nominal voltages).
 */
export function BusTable({ result, standard, selectedBus, onSelectBus, perUnit }: { result: CircuitResult; standard: WiringStandard; selectedBus?: string | null; onSelectBus?: (bus: string) => void; perUnit?: PerUnitSettings }) {
  const [units, setUnits] = useState<ResultUnits>('si');
  const bases = useMemo(() => perUnit ?? readPerUnitSettings(undefined), [perUnit]);
  const columns = useMemo(() => busColumns(result, standard, units, bases), [result, standard, units, bases]);
  return (
    <div>
      <UnitsSwitch
        label="Bus voltage units"
        lead="Voltages in"
        siWord="V"
        units={units}
        onChange={setUnits}
        note={`of each bus's base: ${bases.baseMva} MVA, base kV per level from the nominal voltages unless the study sets it.`}
      />
      <ResultsTable label="Bus voltages" rows={result.buses} columns={columns} rowId={(b) => b.bus} selectedId={selectedBus} onRowSelect={onSelectBus} />
      <p className="mt-1 text-[11px] text-ink-muted">
        RMS, magnitude∠degrees. Line-to-neutral columns are to earth at a bus without a neutral. Neutral shift: neutral-to-earth voltage, V and % of nominal V_LN.
        Unbalance: IEC |V2|/|V1|; NEMA line-voltage max deviation from average; IEEE phase-voltage (line-to-neutral) max deviation.
      </p>
    </div>
  );
}

