/**
 * Study settings: frequency, phase sequence, nominal voltages of the buses, limit set, which
 * transformer-shift convention is stated, the wiring-colour standard of the diagram and results,
 * and the per-unit bases (system MVA; base kV per voltage level, blank: the level's nominal).
 */
import { zodResolver } from '@hookform/resolvers/zod';
import { useMemo } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { Button } from '../../../components/button.tsx';
import { Dialog } from '../../../components/dialog.tsx';
import { DEFAULT_BASE_MVA, levelKey } from '../../../../shared/report/per-unit.ts';
import type { StudySettings } from '../model/layout.ts';
import { formatQuantity, parseQuantity } from './unit-input.ts';

const SELECT = 'h-8 w-full rounded-[3px] border border-rule-strong bg-panel px-1.5 text-sm disabled:bg-sunken';
const INPUT = 'num h-8 w-full rounded-[3px] border border-rule-strong bg-panel px-1.5 text-sm disabled:bg-sunken aria-[invalid=true]:border-danger';

export interface BusVoltage {
  id: string;
  name: string;
  kvLL?: number;
}

const kvText = z.string().superRefine((s, ctx) => {
  if (s.trim() === '') return;
  const r = parseQuantity(s, 'voltage', 'kV');
  if (!r.ok) ctx.addIssue({ code: 'custom', message: r.message });
  else if (r.value <= 0) ctx.addIssue({ code: 'custom', message: 'A nominal voltage must be above zero.' });
});

const schema = z.object({
  frequency: z.string().superRefine((s, ctx) => {
    const r = parseQuantity(s, 'frequency', 'Hz');
    if (!r.ok) ctx.addIssue({ code: 'custom', message: r.message });
    else if (r.value <= 0 || r.value > 1000) ctx.addIssue({ code: 'custom', message: 'The frequency must be above 0 and at most 1000 Hz.' });
  }),
  sequence: z.enum(['ABC', 'ACB']),
  limitSet: z.enum(['ansi-c84.1', 'iec-en']),
  shiftConvention: z.enum(['north-american', 'iec']),
  wiringStandard: z.enum(['north-american', 'iec-60445']),
  buses: z.array(z.object({ id: z.string(), name: z.string(), kv: kvText })),
  baseMva: z.string().superRefine((s, ctx) => {
    const r = parseQuantity(s, 'apparent', 'MVA');
    if (!r.ok) ctx.addIssue({ code: 'custom', message: r.message });
    else if (!(r.value > 0) || r.value > 1e6) ctx.addIssue({ code: 'custom', message: 'The base power must be above zero (at most 1 000 000 MVA).' });
  }),
  levels: z.array(z.object({ key: z.string(), kv: kvText })),
});
type Values = z.infer<typeof schema>;

interface SettingsDialogProps {
  open: boolean;
  settings: StudySettings;
  buses: BusVoltage[];
  readOnly: boolean;
  onClose: () => void;
  onApply: (s: StudySettings, kv: Record<string, number | undefined>) => void;
}

/**
 * The form exists only while the dialog is open: a closed one would otherwise build its values and
 * reset its form (one field per bus) on every edit of the study, since the bus list follows every edit.
 */
export function SettingsDialog(props: SettingsDialogProps) {
  return props.open ? <SettingsForm {...props} /> : null;
}

function SettingsForm({ open, settings, buses, readOnly, onClose, onApply }: SettingsDialogProps) {
  // Voltage levels: the distinct nominal voltages the buses are given (and any level already based).
  const levels = useMemo(
    () => [...new Set([...buses.flatMap((b) => (b.kvLL !== undefined ? [levelKey(b.kvLL * 1000)] : [])), ...Object.keys(settings.perUnit?.baseKv ?? {})])].sort((a, b) => Number(a) - Number(b)),
    [buses, settings.perUnit],
  );
  const values = useMemo<Values>(
    () => ({
      frequency: `${settings.frequencyHz} Hz`,
      sequence: settings.sequence,
      limitSet: settings.limits?.set ?? 'ansi-c84.1',
      shiftConvention: settings.shiftConvention,
      wiringStandard: settings.wiringStandard,
      buses: buses.map((b) => ({ id: b.id, name: b.name, kv: b.kvLL !== undefined ? formatQuantity(b.kvLL, 'kV') : '' })),
      baseMva: formatQuantity(settings.perUnit?.baseMva ?? DEFAULT_BASE_MVA, 'MVA'),
      levels: levels.map((key) => ({ key, kv: settings.perUnit?.baseKv[key] !== undefined ? formatQuantity(settings.perUnit.baseKv[key], 'kV') : '' })),
    }),
    [settings, buses, levels],
  );
  const form = useForm<Values>({ resolver: zodResolver(schema), values });
  const err = form.formState.errors;
  const submit = form.handleSubmit((v) => {
    const hz = (parseQuantity(v.frequency, 'frequency', 'Hz') as { ok: true; value: number }).value;
    const kv: Record<string, number | undefined> = {};
    for (const b of v.buses) kv[b.id] = b.kv.trim() === '' ? undefined : (parseQuantity(b.kv, 'voltage', 'kV') as { ok: true; value: number }).value;
    const baseKv: Record<string, number> = {};
    for (const l of v.levels) if (l.kv.trim() !== '') baseKv[l.key] = (parseQuantity(l.kv, 'voltage', 'kV') as { ok: true; value: number }).value;
    const baseMva = (parseQuantity(v.baseMva, 'apparent', 'MVA') as { ok: true; value: number }).value;
    const perUnit = baseMva === DEFAULT_BASE_MVA && Object.keys(baseKv).length === 0 ? undefined : { baseMva, baseKv };
    onApply(
      {
        ...settings,
        frequencyHz: hz,
        sequence: v.sequence,
        limits: { ...(settings.limits ?? {}), set: v.limitSet },
        shiftConvention: v.shiftConvention,
        wiringStandard: v.wiringStandard,
        perUnit,
      },
      kv,
    );
  });
  return (
    <Dialog open={open} title="Study settings" onClose={onClose} width="max-w-xl">
      <form onSubmit={(e) => void submit(e)} noValidate>
        <fieldset disabled={readOnly} className="grid grid-cols-2 gap-x-4 gap-y-2.5 text-[13px]">
          <div>
            <label htmlFor="st-frequency" className="font-semibold">
              Frequency (Hz)
            </label>
            <input id="st-frequency" className={INPUT} aria-invalid={err.frequency ? true : undefined} {...form.register('frequency')} />
            {err.frequency ? <p className="text-[12px] text-danger">{err.frequency.message}</p> : null}
          </div>
          <div>
            <label htmlFor="st-sequence" className="font-semibold">
              Phase sequence
            </label>
            <select id="st-sequence" className={SELECT} {...form.register('sequence')}>
              <option value="ABC">ABC (B lags A by 120°)</option>
              <option value="ACB">ACB (C lags A by 120°)</option>
            </select>
          </div>
          <div>
            <label htmlFor="st-limits" className="font-semibold">
              Limit set
            </label>
            <select id="st-limits" className={SELECT} {...form.register('limitSet')}>
              <option value="ansi-c84.1">ANSI C84.1 ranges A/B, 3 % line-voltage unbalance</option>
              <option value="iec-en">EN 50160 ±10 %, IEC 2 % unbalance</option>
            </select>
          </div>
          <div>
            <label htmlFor="st-shift" className="font-semibold">
              Transformer-shift convention
            </label>
            <select id="st-shift" className={SELECT} {...form.register('shiftConvention')}>
              <option value="north-american">North American: LV lags HV by 30° (D–Y, Y–D)</option>
              <option value="iec">IEC clock number (Dyn1: LV lags 30°)</option>
            </select>
          </div>
          <div className="col-span-2">
            <label htmlFor="st-wiring" className="font-semibold">
              Wiring colours
            </label>
            <select id="st-wiring" className={SELECT} {...form.register('wiringStandard')}>
              <option value="north-american">North American practice (A black, B red, C blue, N white/grey)</option>
              <option value="iec-60445">IEC 60445 (L1 brown, L2 black, L3 grey, N blue)</option>
            </select>
          </div>
          <div className="col-span-2">
            <h3 className="font-semibold">Nominal voltages (line to line, kV; blank: taken from the source or transformer)</h3>
            {buses.length === 0 ? <p className="text-ink-muted">No buses yet.</p> : null}
            <div className="mt-1 grid grid-cols-2 gap-x-4 gap-y-1">
              {buses.map((b, i) => (
                <div key={b.id} className="flex items-center gap-2">
                  <label htmlFor={`st-bus-${i}`} className="num w-24 truncate">
                    {b.name}
                  </label>
                  <input id={`st-bus-${i}`} className={INPUT} aria-invalid={err.buses?.[i]?.kv ? true : undefined} {...form.register(`buses.${i}.kv`)} />
                  {err.buses?.[i]?.kv ? <p className="text-[12px] text-danger">{err.buses[i]?.kv?.message}</p> : null}
                </div>
              ))}
            </div>
          </div>
          <div className="col-span-2">
            <h3 className="font-semibold">Per-unit bases (results, report and CSV in pu)</h3>
            <div className="mt-1 grid grid-cols-2 gap-x-4 gap-y-1">
              <div className="flex items-center gap-2">
                <label htmlFor="st-base-mva" className="w-24">
                  System base (MVA)
                </label>
                <input id="st-base-mva" className={INPUT} aria-invalid={err.baseMva ? true : undefined} {...form.register('baseMva')} />
              </div>
              {levels.map((key, i) => (
                <div key={key} className="flex items-center gap-2">
                  <label htmlFor={`st-level-${i}`} className="num w-24">
                    Base kV, {key} kV level
                  </label>
                  <input id={`st-level-${i}`} placeholder={`${key} kV`} className={INPUT} aria-invalid={err.levels?.[i]?.kv ? true : undefined} {...form.register(`levels.${i}.kv`)} />
                  {err.levels?.[i]?.kv ? <p className="text-[12px] text-danger">{err.levels[i]?.kv?.message}</p> : null}
                </div>
              ))}
            </div>
            {err.baseMva ? <p className="text-[12px] text-danger">{err.baseMva.message}</p> : null}
            <p className="text-[12px] text-ink-muted">Z_base = kV² / MVA, I_base = MVA / (√3 kV); a level left blank is based on its nominal voltage.</p>
          </div>
        </fieldset>
        <p className="mt-3 text-[12px] text-ink-muted">Phasors are RMS, magnitude∠degrees; S = V·I* in load convention (Q &gt; 0 lagging); earth is the reference node.</p>
        <div className="mt-4 flex justify-end gap-2">
          <Button onClick={onClose}>{readOnly ? 'Close' : 'Cancel'}</Button>
          {readOnly ? null : (
            <Button type="submit" variant="primary">
              Apply settings
            </Button>
          )}
        </div>
      </form>
    </Dialog>
  );
}
