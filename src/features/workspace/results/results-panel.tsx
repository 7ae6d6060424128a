/**
 * The results panel (contract 5): status of the live solve, the engine error in plain words,
 * floating parts, limits and flags, bus and element tables, the phasor diagram and waveforms of
 * the selected bus/element, transformers, faults, the power balance and the safety caution.
 * `selection` is the canvas's selected bus name or element id, so the panel follows the canvas.
 */
import { memo, useCallback, useDeferredValue, useEffect, useId, useMemo, useRef, useState, type ReactNode } from 'react';
import type { CircuitResult } from '../../../../shared/engine/index.ts';
import type { PerUnitSettings } from '../../../../shared/report/per-unit.ts';
import { circuitIssueWords } from '../../../../shared/review/circuit-issues.ts';
import type { LiveSolveError } from '../solve/solve-protocol.ts';
import type { LiveSolveStatus } from '../solve/use-live-solve.ts';
import { BusTable } from './bus-table.tsx';
import { ElementTable } from './element-table.tsx';
import { LoadTable } from './load-table.tsx';
import { SequenceCurrentTable, SequenceVoltageTable } from './sequence-tables.tsx';
import { formatMagnitude } from './format.ts';
import { lnLabel, phaseStyle, type WiringStandard } from './phase-style.ts';
import { PhasorDiagram } from './phasor-diagram.tsx';
import { generatedNameWords, hidePrivate, publicBus, publicText } from './private-names.ts';
import { FaultSection, FlagsSection, FloatingNotices, PowerSummary, ResultsCaution, TransformerSection } from './result-sections.tsx';
import { WaveformChart, type WaveSignal } from './waveform-chart.tsx';

export interface ResultsPanelProps {
  status: LiveSolveStatus;
  result?: CircuitResult;
  error?: LiveSolveError;
  /** True when `result` belongs to an earlier edit (solving or failed since). */
  stale?: boolean;
  ms?: number;
  /** Selected canvas node: a bus name or an element id. */
  selection?: string | null;
  /** Called when a table row is chosen, so the canvas can follow. */
  onSelect?: (id: string) => void;
  standard?: WiringStandard;
  /**
   * Marker of generated names (the canvas's private terminal buses and connection switches, e.g.
   * "~"): those buses and elements stay out of the lists, and a selection on one follows it to the
   * bus the user drew. A string, so the memoised panel compares it by value. Default "~", the
   * canvas's PRIVATE_SEP (model/canvas-to-circuit.ts); "" shows every name.
   */
  privateMarker?: string;
  /** Per-unit bases of the study (the bus table's pu view); default 1 MVA and the nominal voltages. */
  perUnit?: PerUnitSettings;
}

/** How long values wait for a new answer before they are dimmed, ms. */
const DIM_AFTER_MS = 150;

/** Why the neutral shifted, in a few words, by cause (a fault's shift is not a lost neutral). */
const NEUTRAL_CAUSE_SHORT: Record<NonNullable<CircuitResult['buses'][number]['neutralCause']>, (openAt: string[]) => string> = {
  'open-neutral': (openAt) => `the neutral is open upstream${openAt.length ? ` (${openAt.join(', ')})` : ''}`,
  'floating-neutral': () => 'a floating neutral (not joined to any source neutral)',
  fault: () => "the fault in this study shifts it (the fault's effect, not a lost neutral)",
  unbalance: () => 'unbalanced load current through the intact neutral',
};

const CODE_WORDS: Record<string, string> = {
  'invalid-circuit': 'The circuit has a problem to fix',
  'ill-posed-network': 'The network has no unique solution',
  'singular-network': 'The network could not be solved',
  'non-convergence': 'The voltage-dependent loads did not converge',
  internal: 'The solve failed',
};

/**
 * The bus the panel shows: the selected bus, the first (drawn) bus of a selected element, else the
 * bus with the largest neutral shift. `result` is the full result; `shown` the one the lists use.
 */
export function pickBus(result: CircuitResult, selection: string | null | undefined, privateMarker?: string, shown: CircuitResult = result): string | undefined {
  if (selection) {
    if (shown.buses.some((b) => b.bus === selection)) return selection;
    const el = result.elements[selection];
    for (const p of el?.ports ?? []) {
      const bus = p.bus ? publicBus(result, p.bus, privateMarker) : undefined;
      if (bus && shown.buses.some((b) => b.bus === bus)) return bus;
    }
  }
  result = shown;
  let best = result.buses[0];
  for (const b of result.buses) if ((b.neutralToEarth?.mag ?? 0) > (best?.neutralToEarth?.mag ?? 0)) best = b;
  return best?.bus;
}

function StatusLine({ status, ms, stale }: { status: LiveSolveStatus; ms?: number; stale?: boolean }) {
  const text =
    status === 'idle'
      ? 'Nothing to solve yet: add a source and a load.'
      : status === 'solving'
        ? stale
          ? 'Solving the latest edit… (showing the previous solution)'
          : 'Solving…'
        : status === 'ok'
          ? `Solved${ms !== undefined ? ` in ${ms < 10 ? ms.toFixed(1) : ms.toFixed(0)} ms` : ''}.`
          : stale
            ? 'The latest edit could not be solved; showing the last good solution.'
            : 'The circuit could not be solved.';
  return (
    <p role="status" className={`text-[12px] ${status === 'error' ? 'text-danger' : 'text-ink-muted'}`}>
      {text}
    </p>
  );
}

/**
 * The engine's objection in the words of the diagram: element names as drawn (a generated name
 * becomes "the connection of …"), each problem as a form error ("element HEATER: every phase ›
 * P (kW) must be a number"), never a schema path.
 */
function ErrorNotice({ error, privateMarker }: { error: LiveSolveError; privateMarker: string }) {
  const names = [...new Set(error.elementIds.map((id) => generatedNameWords(id, privateMarker)))];
  const issues = (error.issues ?? []).map((i) => publicText(i.text ?? circuitIssueWords(null, i), privateMarker));
  // An invalid circuit's message repeats its first issue as a path; the list below says it in words.
  const message = issues.length > 0 ? null : publicText(error.message, privateMarker);
  return (
    <div role="alert" className="rounded-[3px] border border-danger/50 bg-danger-soft px-2 py-1.5 text-[12px]">
      <p className="font-semibold">
        <span aria-hidden="true">✕ </span>
        {CODE_WORDS[error.code] ?? CODE_WORDS.internal}
        {names.length > 0 ? ` (${names.join(', ')})` : ''}
      </p>
      {message ? <p>{message}</p> : null}
      {issues.length > 0 ? (
        <ul className="mt-0.5 list-disc pl-4">
          {issues.slice(0, 8).map((text, k) => (
            <li key={k}>{text}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

function Section({ title, children }: { title: string; children: ReactNode }) {
  const id = useId();
  return (
    <section aria-labelledby={id} className="space-y-1">
      <h3 id={id} className="text-[12px] font-semibold uppercase tracking-wide text-ink-muted">
        {title}
      </h3>
      {children}
    </section>
  );
}

interface ResultsBodyProps {
  result: CircuitResult;
  busName: string | undefined;
  bus: CircuitResult['buses'][number] | undefined;
  elementId: string | undefined;
  voltages: WaveSignal[];
  currents: WaveSignal[];
  standard: WiringStandard;
  perUnit?: PerUnitSettings;
  selectId: string;
  onSelect?: (id: string) => void;
  setBusChoice: (bus: string | null) => void;
  setElementChoice: (id: string | null) => void;
}

/** The tables, diagrams and sections of a result: memoised, so a change of status alone leaves them as they are. */
const ResultsBody = memo(function ResultsBody({ result, busName, bus, elementId, voltages, currents, standard, perUnit, selectId, onSelect, setBusChoice, setElementChoice }: ResultsBodyProps) {
  return (
    <div className="space-y-4">
      <p className="text-[11px] text-ink-muted">
        {result.frequencyHz} Hz, sequence {result.conventions.sequence}; phasors RMS, magnitude∠degrees; {result.conventions.power}.
      </p>
      <FloatingNotices result={result} />
      <FlagsSection result={result} />
      <BusTable result={result} standard={standard} perUnit={perUnit} selectedBus={busName} onSelectBus={(b) => (setBusChoice(b), onSelect?.(b))} />
      <LoadTable result={result} standard={standard} perUnit={perUnit} selectedId={elementId} onSelect={(id) => (setElementChoice(id), onSelect?.(id))} />
      {bus ? (
        <Section title={`Phasors at bus ${bus.bus}`}>
          <label htmlFor={selectId} className="mr-1 text-[12px]">
            Bus for phasor diagram
          </label>
          <select id={selectId} value={bus.bus} onChange={(e) => setBusChoice(e.target.value)} className="h-6 rounded-[3px] border border-rule-strong bg-panel px-1 text-[12px]">
            {result.buses.map((b) => (
              <option key={b.bus} value={b.bus}>
                {b.bus}
              </option>
            ))}
          </select>
          <p className="text-[12px]">
            Neutral shift at {bus.bus}:{' '}
            <strong className="num" data-testid="selected-neutral-shift">
              {bus.neutralToEarth ? `${formatMagnitude(bus.neutralToEarth.mag)} V` : 'no neutral'}
            </strong>
            {bus.neutralShiftPercent !== undefined ? <span className="num"> ({bus.neutralShiftPercent.toFixed(1)} % of nominal V_LN)</span> : null}
            {bus.neutralCause && bus.neutralShiftPercent !== undefined && bus.neutralShiftPercent > result.limits.neutralShiftPercent ? (
              <span data-testid="selected-neutral-cause">: {NEUTRAL_CAUSE_SHORT[bus.neutralCause](bus.neutralOpenAt ?? [])}</span>
            ) : null}
          </p>
          <PhasorDiagram bus={bus} standard={standard} />
        </Section>
      ) : null}
      <Section title="Waveforms over one cycle">
        <label className="mr-1 text-[12px]" htmlFor={`${selectId}-el`}>
          Element for currents
        </label>
        <select id={`${selectId}-el`} value={elementId ?? ''} onChange={(e) => setElementChoice(e.target.value || null)} className="h-6 rounded-[3px] border border-rule-strong bg-panel px-1 text-[12px]">
          <option value="">none</option>
          {Object.values(result.elements)
            .filter((e) => e.ports?.length)
            .map((e) => (
              <option key={e.id} value={e.id}>
                {e.id}
              </option>
            ))}
        </select>
        <WaveformChart key={`${bus?.bus ?? ''}|${elementId ?? ''}`} voltages={voltages} currents={currents} frequencyHz={result.frequencyHz} />
      </Section>
      <ElementTable result={result} standard={standard} perUnit={perUnit} selectedId={elementId} onSelect={(id) => (setElementChoice(id), onSelect?.(id))} />
      <SequenceVoltageTable result={result} perUnit={perUnit} selectedBus={busName} onSelectBus={(b) => (setBusChoice(b), onSelect?.(b))} />
      <SequenceCurrentTable result={result} perUnit={perUnit} selectedId={elementId} onSelect={(id) => (setElementChoice(id), onSelect?.(id))} />
      <TransformerSection result={result} />
      <FaultSection result={result} standard={standard} perUnit={perUnit} />
      <PowerSummary result={result} perUnit={perUnit} />
    </div>
  );
});

function ResultsPanelView({ status, result: latestResult, error, stale, ms, selection, onSelect, standard = 'iec-60445', privateMarker = '~', perUnit }: ResultsPanelProps) {
  // The tables follow a new result in a render of their own, after the diagram's values and the
  // status have been painted (they are long, and mostly below the diagram); they are dimmed until then.
  const fullResult = useDeferredValue(latestResult);
  const behind = fullResult !== latestResult;
  // The values are dimmed when they do not belong to what is drawn: at once when the latest edit
  // failed, and after a short while when its answer or the tables' render is still on its way (a
  // quick solve then repaints nothing but its values, rather than the whole panel twice).
  const waiting = status === 'solving' || behind;
  const [slow, setSlow] = useState(false);
  useEffect(() => {
    if (!waiting) return setSlow(false);
    const t = setTimeout(() => setSlow(true), DIM_AFTER_MS);
    return () => clearTimeout(t);
  }, [waiting]);
  const dim = (status === 'error' && stale) || (waiting && slow);
  const result = useMemo(() => (fullResult ? hidePrivate(fullResult, privateMarker) : undefined), [fullResult, privateMarker]);
  const [busChoice, setBusChoice] = useState<string | null>(null);
  const [elementChoice, setElementChoice] = useState<string | null>(null);
  const selectId = useId();
  // A new canvas selection overrides the panel's own choice.
  const [lastSelection, setLastSelection] = useState(selection);
  if (selection !== lastSelection) {
    setLastSelection(selection);
    setBusChoice(null);
    setElementChoice(null);
  }
  const busName = result && fullResult ? (busChoice && result.buses.some((b) => b.bus === busChoice) ? busChoice : pickBus(fullResult, selection, privateMarker, result)) : undefined;
  const bus = result?.buses.find((b) => b.bus === busName);
  const elementId = result ? (elementChoice && result.elements[elementChoice] ? elementChoice : selection && result.elements[selection] ? selection : undefined) : undefined;
  const element = elementId ? result?.elements[elementId] : undefined;

  const voltages = useMemo<WaveSignal[]>(
    () =>
      bus
        ? Object.entries(bus.lineToNeutral).map(([p, v]) => {
            const s = phaseStyle(p, standard);
            return { id: `v-${p}`, label: `${lnLabel(p, standard, bus.lnReference)} ${formatMagnitude(v.mag)} V`, phasor: v, color: s.color, dash: s.dash };
          })
        : [],
    [bus, standard],
  );
  const currents = useMemo<WaveSignal[]>(() => {
    const port = element?.ports?.[0];
    if (!port) return [];
    return port.conductors.map((c, i) => {
      const s = phaseStyle(c, standard);
      return { id: `i-${c}`, label: `I ${s.label} ${formatMagnitude(port.currents[i].mag)} A`, phasor: port.currents[i], color: s.color, dash: s.dash };
    });
  }, [element, standard]);

  return (
    <section aria-label="Results" className="space-y-3 bg-panel p-3">
      <div className="flex items-baseline justify-between gap-2">
        <h2 className="text-[14px] font-semibold">Results</h2>
        <StatusLine status={status} ms={ms} stale={stale} />
      </div>
      {status === 'error' && error ? <ErrorNotice error={error} privateMarker={privateMarker} /> : null}
      {result ? (
        // The values are dimmed while the next edit solves: the class sits outside the tables, which
        // re-render only when their own inputs change (not when the status line does).
        <div className={dim ? 'opacity-70' : undefined} aria-busy={waiting || undefined}>
          <ResultsBody
            result={result}
            busName={busName}
            bus={bus}
            elementId={elementId}
            voltages={voltages}
            currents={currents}
            standard={standard}
            perUnit={perUnit}
            selectId={selectId}
            onSelect={onSelect}
            setBusChoice={setBusChoice}
            setElementChoice={setElementChoice}
          />
        </div>
      ) : null}
      <ResultsCaution />
    </section>
  );
}

const MemoResultsPanel = memo(ResultsPanelView);

/**
 * The panel re-renders only when its data changes: the workspace page re-renders on every frame of
 * a node drag, and a 300-element study's tables are too heavy to rebuild that often. `onSelect` is
 * held in a ref so a new callback identity alone does not count as a change.
 */
export function ResultsPanel(props: ResultsPanelProps) {
  const onSelectRef = useRef(props.onSelect);
  useEffect(() => {
    onSelectRef.current = props.onSelect;
  });
  const stableOnSelect = useCallback((id: string) => onSelectRef.current?.(id), []);
  return <MemoResultsPanel {...props} onSelect={props.onSelect ? stableOnSelect : undefined} />;
}
