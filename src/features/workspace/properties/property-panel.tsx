/**
 * The side panel for the selection: an element's properties, a bus's name and nominal voltage, or a
 * connection's conductors with one button per conductor to open or close it ("Open neutral").
 */
import { zodResolver } from '@hookform/resolvers/zod';
import { memo, useId, useMemo } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import type { CircuitElementInput } from '../../../../shared/engine/index.ts';
import { phaseStyle } from '../results/phase-style.ts';
import type { WiringStandard } from '../model/layout.ts';
import { isBundleHandle } from '../model/ports.ts';
import { busConductors, type BusNodeData, type Conductor, type WorkspaceEdge } from '../model/types.ts';
import { ELEMENT_WORDS } from '../canvas/symbols.tsx';
import type { PerUnitSettings } from '../../../../shared/report/per-unit.ts';
import { ElementForm } from './element-form.tsx';
import { PerUnitReadout } from './per-unit-readout.tsx';
import { formatQuantity, parseQuantity } from './unit-input.ts';

const INPUT = 'num h-7 w-full rounded-[3px] border border-rule-strong bg-panel px-1.5 text-[13px] disabled:border-rule disabled:bg-sunken disabled:text-ink-muted aria-[invalid=true]:border-danger';

export type Selection =
  | { kind: 'element'; id: string; element: CircuitElementInput }
  | { kind: 'bus'; id: string; data: BusNodeData }
  | { kind: 'edge'; edge: WorkspaceEdge; elementId: string; busName: string; splitPhase: boolean }
  | null;

interface Props {
  selection: Selection;
  readOnly: boolean;
  wiringStandard: WiringStandard;
  busNames: string[];
  onElement: (id: string, next: CircuitElementInput) => void;
  onBus: (id: string, next: BusNodeData) => void;
  onToggleOpen: (edgeId: string, conductor: Conductor) => void;
  /** Per-unit bases of the study (sources, lines and banks show their impedance in pu on them). */
  perUnit?: PerUnitSettings;
}

/** Words for a conductor in a button name: "neutral", "phase A", "leg 1". */
export function conductorWords(c: Conductor): string {
  return c === 'n' ? 'neutral' : c === '1' || c === '2' ? `leg ${c}` : `phase ${c.toUpperCase()}`;
}

/** Memoised: the workspace re-renders on every frame of a drag, the panel only when its props change. */
export const PropertyPanel = memo(function PropertyPanel({ selection, readOnly, wiringStandard, busNames, onElement, onBus, onToggleOpen, perUnit }: Props) {
  return (
    <section aria-label="Properties" className="flex w-[250px] shrink-0 flex-col gap-2 overflow-y-auto border-l border-rule bg-panel p-2.5 max-md:max-h-[50vh] max-md:w-full max-md:border-l-0 max-md:border-t">
      {selection === null ? (
        <p className="text-[12px] text-ink-muted">Select a bus, element or connection to see its properties.</p>
      ) : selection.kind === 'element' ? (
        <>
          <h2 className="text-[13px]">
            {ELEMENT_WORDS[selection.element.type] ?? selection.element.type} <span className="num">{selection.id}</span>
          </h2>
          <ElementForm key={selection.id} element={selection.element} readOnly={readOnly} onApply={(next) => onElement(selection.id, next)} />
          <PerUnitReadout element={selection.element} perUnit={perUnit} />
        </>
      ) : selection.kind === 'bus' ? (
        <BusForm key={selection.id} data={selection.data} readOnly={readOnly} taken={busNames.filter((n) => n !== selection.data.name)} onApply={(d) => onBus(selection.id, d)} />
      ) : (
        <ConnectionPanel selection={selection} readOnly={readOnly} wiringStandard={wiringStandard} onToggleOpen={onToggleOpen} />
      )}
    </section>
  );
});

function ConnectionPanel({ selection, readOnly, wiringStandard, onToggleOpen }: { selection: Extract<Selection, { kind: 'edge' }>; readOnly: boolean; wiringStandard: WiringStandard; onToggleOpen: Props['onToggleOpen'] }) {
  const { edge } = selection;
  const conductors: Conductor[] = isBundleHandle(edge.targetHandle) ? busConductors(selection.splitPhase) : [edge.targetHandle as Conductor];
  const open = edge.data?.open ?? [];
  return (
    <div className="flex flex-col gap-2">
      <h2 className="text-[13px]">
        Connection <span className="num">{selection.elementId}</span> → bus <span className="num">{selection.busName}</span>
      </h2>
      <p className="text-[12px] text-ink-muted">Open a conductor of this connection alone (a broken neutral, a blown fuse). The rest stay closed.</p>
      <ul className="flex flex-col gap-1">
        {conductors.map((c) => {
          const st = phaseStyle(c, wiringStandard);
          const isOpen = open.includes(c);
          return (
            <li key={c} className="flex items-center gap-2 text-[13px]">
              <svg width={26} height={8} aria-hidden="true">
                <line x1={1} y1={4} x2={25} y2={4} stroke={st.color} strokeWidth={3} strokeDasharray={st.dash || undefined} />
              </svg>
              <span className="num w-7 font-semibold">{st.label}</span>
              <span className={`w-12 text-[12px] ${isOpen ? 'font-semibold text-danger' : 'text-ink-muted'}`}>{isOpen ? 'open' : 'closed'}</span>
              {readOnly ? null : (
                <button type="button" className="ml-auto rounded-[3px] border border-rule-strong px-2 py-0.5 text-[12px] font-semibold hover:bg-sunken" onClick={() => onToggleOpen(edge.id, c)}>
                  {isOpen ? 'Close' : 'Open'} {conductorWords(c)}
                </button>
              )}
            </li>
          );
        })}
      </ul>
    </div>
  );
}

function BusForm({ data, readOnly, taken, onApply }: { data: BusNodeData; readOnly: boolean; taken: string[]; onApply: (d: BusNodeData) => void }) {
  const id = useId();
  const schema = useMemo(
    () =>
      z.object({
        name: z
          .string()
          .trim()
          .min(1, 'A bus needs a name.')
          .regex(/^[^.\s~]+$/, 'A bus name cannot contain dots, spaces or “~”.')
          .refine((s) => s.toLowerCase() !== 'earth', '“earth” is the reference node; choose another name.')
          .refine((s) => !taken.includes(s), 'Another bus already has this name.'),
        kv: z.string().superRefine((s, ctx) => {
          if (s.trim() === '') return;
          const r = parseQuantity(s, 'voltage', 'kV');
          if (!r.ok) ctx.addIssue({ code: 'custom', message: r.message });
          else if (r.value <= 0) ctx.addIssue({ code: 'custom', message: 'A nominal voltage must be above zero.' });
        }),
        label: z.string().max(200, 'Keep the label under 200 characters.'),
      }),
    [taken],
  );
  type V = z.infer<typeof schema>;
  const values = useMemo(() => ({ name: data.name, kv: data.kvLL !== undefined ? formatQuantity(data.kvLL, 'kV') : '', label: data.label ?? '' }), [data]);
  const form = useForm<V>({ resolver: zodResolver(schema), values, mode: 'onBlur' });
  const submit = form.handleSubmit((v) => {
    const kv = v.kv.trim() === '' ? undefined : (parseQuantity(v.kv, 'voltage', 'kV') as { ok: true; value: number }).value;
    const next: BusNodeData = { kind: 'bus', name: v.name.trim(), splitPhase: data.splitPhase, ...(kv !== undefined ? { kvLL: kv } : {}), ...(v.label.trim() ? { label: v.label.trim() } : {}) };
    if (JSON.stringify(next) !== JSON.stringify(data)) onApply(next);
  });
  const err = form.formState.errors;
  return (
    <form onSubmit={(e) => void submit(e)} noValidate aria-label={`Properties of bus ${data.name}`}>
      <h2 className="mb-2 text-[13px]">
        Bus <span className="num">{data.name}</span>
      </h2>
      <fieldset disabled={readOnly} className="flex flex-col gap-2">
        {(
          [
            ['name', 'Name'],
            ['kv', 'Nominal voltage, line to line (kV)'],
            ['label', 'Label'],
          ] as const
        ).map(([k, label]) => (
          <div key={k} className="flex flex-col gap-0.5">
            <label htmlFor={`${id}-${k}`} className="text-[12px] text-ink-muted">
              {label}
            </label>
            <input id={`${id}-${k}`} className={INPUT} autoComplete="off" aria-invalid={err[k] ? true : undefined} {...form.register(k, { onBlur: () => void submit() })} />
            {err[k] ? <p className="text-[12px] text-danger">{err[k]?.message}</p> : null}
          </div>
        ))}
        <div className="flex flex-col gap-0.5">
          <label htmlFor={`${id}-split`} className="text-[12px] text-ink-muted">
            Conductors
          </label>
          <select id={`${id}-split`} className={INPUT} value={data.splitPhase ? 'split' : 'three'} onChange={(e) => onApply({ ...data, splitPhase: e.target.value === 'split' })}>
            <option value="three">Three-phase: A, B, C, N</option>
            <option value="split">Split-phase: legs 1, 2 and N</option>
          </select>
        </div>
        <button type="submit" className="sr-only">
          Apply
        </button>
      </fieldset>
    </form>
  );
}
