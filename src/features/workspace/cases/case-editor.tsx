/**
 * The case editor: the study's cases (create, rename, delete), which one the canvas shows, and the
 * shown case's overrides, each picked from an element as drawn and one of its numeric values (or a
 * line's open conductors). Changing the shown case re-solves (the page passes it to the live solve);
 * the list is part of the study and saved with it. Read-only roles see the list and may switch cases.
 */
import { useMemo, useState } from 'react';
import { BASE_CASE_ID, type StudyCase } from '../../../../shared/engine/index.ts';
import { conductorWords } from '../../../../shared/review/user-names.ts';
import { Button } from '../../../components/button.tsx';
import { addCase, caseNameProblem, deleteCase, drawnElementsOf, numericParameters, openableConductors, overrideRows, removeOverride, renameCase, setOverride } from './case-model.ts';

export interface CaseEditorProps {
  cases: StudyCase[];
  /** The base circuit as drawn (with its cases). */
  circuit: unknown;
  active: string;
  onActivate: (id: string) => void;
  /** Null for read-only roles. */
  onChange: ((cases: StudyCase[]) => void) | null;
  /** Why the shown case cannot be built (an element it names is gone …), in words. */
  error?: string;
}

const nameOf = (c: StudyCase) => (c.name && c.name.trim() ? c.name : c.id);

export function CaseEditor({ cases, circuit, active, onActivate, onChange, error }: CaseEditorProps) {
  const [naming, setNaming] = useState<null | { mode: 'new' | 'rename'; text: string }>(null);
  const shown = cases.find((c) => c.id === active);
  const problem = naming ? caseNameProblem(cases, naming.text, naming.mode === 'rename' ? active : undefined) : null;

  const submitName = () => {
    if (!naming || problem || !onChange) return;
    if (naming.mode === 'new') {
      const next = addCase(cases, naming.text);
      onChange(next);
      onActivate(next[next.length - 1].id);
    } else onChange(renameCase(cases, active, naming.text));
    setNaming(null);
  };

  return (
    <section aria-label="Study cases" className="flex flex-col gap-1.5 rounded-[3px] border border-rule bg-panel px-2 py-1.5 text-[13px]">
      <div className="flex flex-wrap items-center gap-1.5">
        <label className="flex items-center gap-1.5 font-semibold">
          Case shown
          <select aria-label="Case shown" className="h-7 rounded-[3px] border border-rule-strong bg-paper px-1 font-normal" value={shown ? active : BASE_CASE_ID} onChange={(e) => onActivate(e.target.value)}>
            <option value={BASE_CASE_ID}>Base (as drawn)</option>
            {cases.map((c) => (
              <option key={c.id} value={c.id}>
                {nameOf(c)}
              </option>
            ))}
          </select>
        </label>
        {onChange ? (
          <>
            <Button size="sm" onClick={() => setNaming({ mode: 'new', text: '' })}>
              New case
            </Button>
            <Button size="sm" disabled={!shown} onClick={() => shown && setNaming({ mode: 'rename', text: nameOf(shown) })}>
              Rename case
            </Button>
            <Button
              size="sm"
              variant="danger"
              disabled={!shown}
              onClick={() => {
                if (!shown) return;
                onActivate(BASE_CASE_ID);
                onChange(deleteCase(cases, shown.id));
              }}
            >
              Delete case
            </Button>
          </>
        ) : null}
        {shown ? <span className="text-[12px] text-ink-muted">The canvas shows this case read-only; choose Base to edit the drawing.</span> : null}
      </div>
      {naming ? (
        <form
          className="flex flex-wrap items-center gap-1.5"
          onSubmit={(e) => {
            e.preventDefault();
            submitName();
          }}
        >
          <label className="flex items-center gap-1.5">
            {naming.mode === 'new' ? 'Name of the new case' : 'New name'}
            <input autoFocus aria-label="Case name" aria-invalid={!!problem && naming.text !== ''} className="h-7 rounded-[3px] border border-rule-strong bg-paper px-1" value={naming.text} onChange={(e) => setNaming({ ...naming, text: e.target.value })} />
          </label>
          <Button size="sm" variant="primary" type="submit" disabled={!!problem}>
            {naming.mode === 'new' ? 'Create case' : 'Rename'}
          </Button>
          <Button size="sm" variant="ghost" onClick={() => setNaming(null)}>
            Cancel
          </Button>
          {problem && naming.text !== '' ? <span className="text-[12px] text-danger">{problem}</span> : null}
        </form>
      ) : null}
      {shown ? <Overrides c={shown} cases={cases} circuit={circuit} onChange={onChange} /> : null}
      {shown && error ? (
        <p role="alert" className="text-[12px] text-danger">
          ✕ This case cannot be built: {error}
        </p>
      ) : null}
    </section>
  );
}

function Overrides({ c, cases, circuit, onChange }: { c: StudyCase; cases: StudyCase[]; circuit: unknown; onChange: CaseEditorProps['onChange'] }) {
  const rows = useMemo(() => overrideRows(c, circuit), [c, circuit]);
  const elements = useMemo(() => drawnElementsOf(circuit), [circuit]);
  const [elementId, setElementId] = useState('');
  const [param, setParam] = useState('');
  const [value, setValue] = useState('');
  const element = elements.find((e) => e.id === elementId);
  const params = useMemo(() => (element ? numericParameters(element) : []), [element]);
  const conductors = element ? openableConductors(element) : null;
  const OPEN = '(open conductors)';
  const [open, setOpen] = useState<string[]>([]);
  const num = Number(value.trim());
  const valueOk = value.trim() !== '' && Number.isFinite(num);

  const apply = () => {
    if (!onChange || !element) return;
    if (param === OPEN) onChange(setOverride(cases, c.id, circuit, elementId, 'open', open));
    else if (param && valueOk) onChange(setOverride(cases, c.id, circuit, elementId, param, num));
    setValue('');
  };

  return (
    <div className="flex flex-col gap-1">
      {rows.length === 0 ? <p className="text-[12px] text-ink-muted">This case changes nothing yet: pick an element and a value below.</p> : null}
      <ul aria-label="Changes of this case" className="flex flex-col gap-0.5">
        {rows.map((r) => (
          <li key={`${r.changeIndex}:${r.field ?? ''}`} className="flex items-center gap-2">
            <span>{r.text}</span>
            {onChange ? (
              <Button size="sm" variant="ghost" aria-label={`Undo change: ${r.text}`} onClick={() => onChange(removeOverride(cases, c.id, r.changeIndex, r.field))}>
                ✕
              </Button>
            ) : null}
          </li>
        ))}
      </ul>
      {onChange ? (
        <form
          aria-label="Add a change"
          className="flex flex-wrap items-center gap-1.5"
          onSubmit={(e) => {
            e.preventDefault();
            apply();
          }}
        >
          <select aria-label="Element to change" className="h-7 rounded-[3px] border border-rule-strong bg-paper px-1" value={elementId} onChange={(e) => (setElementId(e.target.value), setParam(''), setOpen([]))}>
            <option value="">Element…</option>
            {elements.map((e) => (
              <option key={e.id as string} value={e.id as string}>
                {e.id as string}
              </option>
            ))}
          </select>
          <select aria-label="Value to change" className="h-7 rounded-[3px] border border-rule-strong bg-paper px-1" value={param} disabled={!element} onChange={(e) => setParam(e.target.value)}>
            <option value="">Value…</option>
            {params.map((p) => (
              <option key={p.path} value={p.path}>
                {p.label} (now {p.value})
              </option>
            ))}
            {conductors ? <option value={OPEN}>open conductors</option> : null}
          </select>
          {param === OPEN && conductors ? (
            <fieldset className="flex items-center gap-1.5">
              <legend className="sr-only">Conductors open in this case</legend>
              {conductors.map((k) => (
                <label key={k} className="flex items-center gap-0.5">
                  <input type="checkbox" checked={open.includes(k)} onChange={(e) => setOpen(e.target.checked ? [...open, k] : open.filter((x) => x !== k))} />
                  {conductorWords([k])}
                </label>
              ))}
            </fieldset>
          ) : (
            <input aria-label="New value" inputMode="decimal" className="h-7 w-24 rounded-[3px] border border-rule-strong bg-paper px-1" value={value} disabled={!param} onChange={(e) => setValue(e.target.value)} />
          )}
          <Button size="sm" type="submit" disabled={!element || !param || (param !== OPEN && !valueOk)}>
            Set in case
          </Button>
          {param && param !== OPEN && value.trim() !== '' && !valueOk ? <span className="text-[12px] text-danger">Enter a number.</span> : null}
        </form>
      ) : null}
    </div>
  );
}
