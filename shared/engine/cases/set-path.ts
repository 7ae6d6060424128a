/**
 * Parameters of sweeps: `<elementId>.<field>[.<subfield>…]` names one numeric value of one element
 * (`KITCHEN.each.kw`, `ROD.ohms`, `DROP.length`, `XFMR-SEC.impedance.ohms.re`). `setPath` returns a
 * new circuit with that value replaced (copies along the path only; the input is not modified).
 */
import { InvalidCircuitError } from '../errors.ts';
import type { CircuitInput } from '../schema/circuit.ts';

type Obj = Record<string, unknown>;
const isObject = (v: unknown): v is Obj => typeof v === 'object' && v !== null;

/** A parameter path split into the element it names and the fields inside it. */
export interface ParameterPath {
  elementId: string;
  fields: string[];
}

function elementsOf(circuit: unknown): Obj[] {
  return isObject(circuit) && Array.isArray((circuit as Obj).elements) ? ((circuit as Obj).elements as Obj[]) : [];
}

/**
 * Split `path` into an element id and fields. Element ids may contain dots: the longest prefix
 * that is an element id wins. Throws InvalidCircuitError when no element matches or no field is given.
 */
export function resolveParameter(circuit: CircuitInput | Obj, path: string): ParameterPath {
  const parts = path.split('.');
  const ids = new Set(elementsOf(circuit).map((e) => (isObject(e) ? e.id : undefined)).filter((x): x is string => typeof x === 'string'));
  for (let n = parts.length - 1; n >= 1; n--) {
    const id = parts.slice(0, n).join('.');
    if (ids.has(id)) {
      const fields = parts.slice(n);
      if (fields.some((f) => f === '')) break;
      return { elementId: id, fields };
    }
  }
  const head = parts[0];
  if (parts.length < 2 || !ids.has(head)) {
    throw new InvalidCircuitError(
      parts.length < 2 ? `parameter "${path}": write it as <element>.<field>[.<subfield>…], e.g. LOAD1.each.kw` : `parameter "${path}": no element "${head}" in the circuit`,
      [{ path: 'parameter', message: `cannot resolve "${path}"` }],
    );
  }
  throw new InvalidCircuitError(`parameter "${path}": empty field name`, [{ path: 'parameter', message: `empty field in "${path}"` }], { elementIds: [head] });
}

/** The current value at a parameter path (undefined when absent). */
export function getPath(circuit: CircuitInput | Obj, path: string): unknown {
  const { elementId, fields } = resolveParameter(circuit, path);
  let v: unknown = elementsOf(circuit).find((e) => isObject(e) && e.id === elementId);
  for (const f of fields) v = isObject(v) ? (v as Obj)[f] : undefined;
  return v;
}

/**
 * A copy of `circuit` with the value at `path` replaced by `value`. Missing intermediate fields are
 * created as objects; an existing value that is an object or a list (not a number) is refused, so a
 * sweep cannot silently replace a whole complex value: name its part (`ohms.re`).
 */
export function setPath(circuit: CircuitInput | Obj, path: string, value: number): CircuitInput {
  const { elementId, fields } = resolveParameter(circuit, path);
  const elements = elementsOf(circuit).slice();
  const i = elements.findIndex((e) => isObject(e) && e.id === elementId);
  const set = (node: unknown, k: number): unknown => {
    const f = fields[k];
    const copy: Obj = Array.isArray(node) ? (node.slice() as unknown as Obj) : isObject(node) ? { ...node } : {};
    if (k === fields.length - 1) {
      const old = copy[f];
      if (old !== undefined && typeof old !== 'number') {
        throw new InvalidCircuitError(`parameter "${path}": the value there is not a number (name a numeric part of it, e.g. ${path}.re or ${path}.kw)`, [{ path: 'parameter', message: 'not a numeric field' }], { elementIds: [elementId] });
      }
      copy[f] = value;
    } else {
      if (copy[f] !== undefined && !isObject(copy[f])) {
        throw new InvalidCircuitError(`parameter "${path}": "${fields.slice(0, k + 1).join('.')}" of element "${elementId}" is a single value, not a group of fields`, [{ path: 'parameter', message: 'not an object' }], { elementIds: [elementId] });
      }
      copy[f] = set(copy[f], k + 1);
    }
    return copy;
  };
  elements[i] = set(elements[i], 0) as Obj;
  return { ...(circuit as Obj), elements } as unknown as CircuitInput;
}
