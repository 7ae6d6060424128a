/**
 * Property form of one element, built from its field list with react-hook-form + zod. Each input
 * parses units and complex values as typed (a plain-words message at the field otherwise); on
 * Enter or leaving a field the whole element is checked with the engine's own schema and applied.
 * Selects that change the element's shape apply at once.
 */
import { useCallback, useId, useMemo } from 'react';
import { useForm, type FieldErrors, type Resolver } from 'react-hook-form';
import { elementSchemas, formatPath, type CircuitElementInput } from '../../../../shared/engine/index.ts';
import { formatComplex, parseComplex } from './complex-input.ts';
import { elementFields, fieldKey, getPath, normaliseLoad, selectValue, setPath, type FieldSpec } from './fields.ts';
import { formatQuantity, parseLength, parseQuantity } from './unit-input.ts';
import { withLength, type LineInput } from '../model/line-units.ts';
import type { LengthUnit } from '../../../../shared/engine/index.ts';

type Values = Record<string, string>;

function parseField(f: FieldSpec, text: string, el: CircuitElementInput): { ok: true; value: unknown } | { ok: false; message: string } {
  const t = text.trim();
  if ('optional' in f && f.optional && t === '') return { ok: true, value: undefined };
  switch (f.kind) {
    case 'quantity':
      return parseQuantity(t, f.dimension, f.unit);
    case 'complex':
      return parseComplex(t, f.perLength);
    case 'length': {
      const r = parseLength(t, (getPath(el, 'lengthUnit') as 'km' | 'm' | 'mi' | 'ft' | undefined) ?? 'km');
      return r;
    }
    case 'phases': {
      if (t === '') return { ok: true, value: undefined };
      const letters = t.toLowerCase().split(/[\s,;]+/).filter(Boolean);
      if (letters.some((l) => !['a', 'b', 'c'].includes(l))) return { ok: false, message: 'List phases as letters a, b or c, e.g. “a” or “b, c”.' };
      return { ok: true, value: letters };
    }
    case 'text':
      return t === '' && f.optional ? { ok: true, value: undefined } : { ok: true, value: t };
    case 'select':
      return { ok: true, value: t };
  }
}

function display(f: FieldSpec, el: CircuitElementInput): string {
  const v = getPath(el, f.path);
  switch (f.kind) {
    case 'quantity':
      return typeof v === 'number' ? formatQuantity(v, f.unit) : '';
    case 'complex':
      return v === undefined ? '' : formatComplex(v as never) + (f.unit ? ` ${f.unit}` : '');
    case 'length':
      return `${typeof v === 'number' ? Number(v.toPrecision(6)) : ''} ${(getPath(el, 'lengthUnit') as string | undefined) ?? 'km'}`;
    case 'phases':
      return Array.isArray(v) ? v.join(', ') : '';
    case 'text':
      return typeof v === 'string' ? v : '';
    case 'select':
      return selectValue(el, f);
  }
}

const INPUT = 'nodrag num h-7 w-full rounded-[3px] border border-rule-strong bg-panel px-1.5 text-[13px] disabled:border-rule disabled:bg-sunken disabled:text-ink-muted aria-[invalid=true]:border-danger';

/** Edits `element`; `onApply` receives the checked element. */
export function ElementForm({ element: given, readOnly, onApply }: { element: CircuitElementInput; readOnly: boolean; onApply: (next: CircuitElementInput) => void }) {
  // A load given as `total` or `each` is edited per branch (the fields name branches).
  const element = useMemo(() => (given.type === 'load' ? normaliseLoad(given) : given), [given]);
  const fields = useMemo(() => elementFields(element), [element]);
  const formId = useId();
  const defaults = useMemo(() => Object.fromEntries(fields.map((f) => [fieldKey(f.path), display(f, element)])), [fields, element]);
  /**
   * One check for blur and submit alike: every field parses, then the whole element passes the
   * engine's own schema; each objection lands beside its field (or under the form). The resolver
   * is the only validation, so the first invalid entry gets its message as surely as the next.
   */
  const check = useCallback((values: Values) => checkElement(element, fields, values, defaults), [element, fields, defaults]);
  const resolver = useCallback<Resolver<Values>>(
    (values) => {
      const r = check(values);
      return r.ok ? { values, errors: {} } : { values: {}, errors: r.errors as FieldErrors<Values> };
    },
    [check],
  );
  const form = useForm<Values>({ resolver, defaultValues: defaults, values: defaults, mode: 'onBlur', reValidateMode: 'onBlur' });
  const formError = (form.formState.errors as FieldErrors<Values & { root: string }>).root?.message;

  const apply = (values: Values) => {
    const r = check(values);
    if (!r.ok) return;
    if (JSON.stringify(r.next) !== JSON.stringify(given)) onApply(r.next);
    // The same value typed another way ("0.19 ohm/km" for 0.057912 Ω per 1000 ft): show it as stored.
    else form.reset(defaults);
  };
  const submit = form.handleSubmit(apply);

  const choose = (f: Extract<FieldSpec, { kind: 'select' }>, value: string) => {
    const next = f.choose ? f.choose(element, value) : (() => {
      const c = structuredClone(element) as Record<string, unknown>;
      setPath(c, f.path, value);
      return c as CircuitElementInput;
    })();
    const checked = elementSchemas[next.type].safeParse(next);
    if (!checked.success) {
      form.setError(fieldKey(f.path), { message: readable(checked.error.issues[0]?.message ?? 'not accepted') });
      return;
    }
    onApply(next);
  };

  return (
    <form id={formId} onSubmit={(e) => void submit(e)} noValidate aria-label={`Properties of ${element.id}`}>
      <fieldset disabled={readOnly} className="flex flex-col gap-2">
        {fields.map((f) => {
          const key = fieldKey(f.path);
          const err = form.formState.errors[key]?.message;
          const inputId = `${formId}-${key}`;
          return (
            <div key={key} className="flex flex-col gap-0.5">
              <label htmlFor={inputId} className="text-[12px] text-ink-muted">
                {f.label}
                {f.kind === 'quantity' && f.unit ? <span className="num"> ({f.unit})</span> : f.kind === 'complex' ? <span className="num"> ({f.unit}, R+jX or mag∠deg)</span> : null}
              </label>
              {f.kind === 'select' ? (
                <select id={inputId} className={INPUT} value={selectValue(element, f)} onChange={(e) => choose(f, e.target.value)}>
                  {f.options.map((o) => (
                    <option key={o.value} value={o.value}>
                      {o.label}
                    </option>
                  ))}
                </select>
              ) : (
                <input
                  id={inputId}
                  className={INPUT}
                  autoComplete="off"
                  spellCheck={false}
                  aria-invalid={err ? true : undefined}
                  aria-describedby={err ? `${inputId}-err` : undefined}
                  {...form.register(key, { onBlur: () => void submit() })}
                />
              )}
              {err ? (
                <p id={`${inputId}-err`} className="text-[12px] text-danger">
                  {err}
                </p>
              ) : null}
            </div>
          );
        })}
        {formError ? <p className="text-[12px] text-danger">{formError}</p> : null}
        {fields.length === 0 ? <p className="text-[12px] text-ink-muted">This element is edited in the circuit file.</p> : null}
        <button type="submit" className="sr-only">
          Apply
        </button>
      </fieldset>
    </form>
  );
}

type Checked = { ok: true; next: CircuitElementInput } | { ok: false; errors: Record<string, { type: string; message: string }> };

/**
 * The element the form's values describe, or the objections per field key: a field that does not
 * parse, then the engine schema's issues placed at the field they concern. A field whose text is
 * still what the form showed keeps its stored value (no rounding from display).
 */
export function checkElement(element: CircuitElementInput, fields: FieldSpec[], values: Values, shown: Values): Checked {
  const errors: Record<string, { type: string; message: string }> = {};
  const next = structuredClone(element) as Record<string, unknown>;
  for (const f of fields) {
    if (f.kind === 'select') continue;
    const key = fieldKey(f.path);
    const text = values[key] ?? '';
    if (text === shown[key]) continue;
    const r = parseField(f, text, element);
    if (!r.ok) {
      errors[key] = { type: 'parse', message: r.message };
      continue;
    }
    if (f.kind === 'length') {
      // A new length (and maybe unit): the per-length data keep their own unit.
      const v = r.value as { length: number; unit: LengthUnit };
      Object.assign(next, withLength(next as LineInput, v.length, v.unit));
    } else setPath(next, f.path, r.value);
  }
  if (Object.keys(errors).length > 0) return { ok: false, errors };
  const checked = elementSchemas[element.type].safeParse(next);
  if (!checked.success) {
    for (const issue of checked.error.issues) {
      const path = issue.path.map(String).join('.');
      const f = fields.find((x) => path === x.path || path.startsWith(`${x.path}.`) || x.path.startsWith(`${path}.`));
      const key = f ? fieldKey(f.path) : 'root';
      if (errors[key]) continue;
      errors[key] = { type: 'schema', message: f ? plainIssue(issue) : `${formatPath(issue.path as (string | number)[])}: ${plainIssue(issue)}` };
    }
    return { ok: false, errors };
  }
  return { ok: true, next: next as CircuitElementInput };
}

/** A schema issue in plain words (zod's own wording for number bounds reads like code). */
function plainIssue(issue: { code: string; message: string; minimum?: unknown; maximum?: unknown; inclusive?: boolean }): string {
  if (issue.code === 'too_small' && typeof issue.minimum === 'number') return issue.minimum === 0 ? (issue.inclusive ? 'This cannot be negative.' : 'This must be above zero.') : `This must be at least ${issue.minimum}.`;
  if (issue.code === 'too_big' && typeof issue.maximum === 'number') return `This must be at most ${issue.maximum}.`;
  return readable(issue.message);
}

/** Engine messages speak of fields in quotes; keep them, but start with a capital. */
function readable(m: string): string {
  return m.charAt(0).toUpperCase() + m.slice(1);
}
