import { act, renderHook, waitFor } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit, type CircuitInput } from '../../../../../shared/engine/index.ts';
import { createSolveHandler } from '../../../../../src/features/workspace/solve/solve-handler.ts';
import { createInThreadPort, type PortListener, type SolvePort } from '../../../../../src/features/workspace/solve/solve-port.ts';
import type { SolveRequest, SolveResponse } from '../../../../../src/features/workspace/solve/solve-protocol.ts';
import { useLiveSolve } from '../../../../../src/features/workspace/solve/use-live-solve.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const withHeater = (kw: number): CircuitInput => ({
  ...openNeutral,
  elements: openNeutral.elements.map((e) => (e.id === 'HEATER' ? { ...e, each: { kw, kvar: 0 } } : e)) as CircuitInput['elements'],
});
const shiftOf = (c: CircuitInput) => solveCircuit(c).buses.find((b) => b.bus === 'HOUSE')!.neutralToEarth!.mag;

/** The real in-thread port, counting the requests that reach it. */
function countingPort(posted: SolveRequest[]) {
  return (onResponse: PortListener): SolvePort => {
    const inner = createInThreadPort(onResponse);
    return { post: (r) => (posted.push(r), inner.post(r)), terminate: () => inner.terminate() };
  };
}

describe('useLiveSolve', () => {
  it('solves the circuit and reports the engine result', async () => {
    const { result } = renderHook(() => useLiveSolve(openNeutral, { createPort: createInThreadPort, debounceMs: 5 }));
    expect(result.current.status).toBe('solving');
    await waitFor(() => expect(result.current.status).toBe('ok'));
    expect(result.current.result!.buses.find((b) => b.bus === 'HOUSE')!.neutralToEarth!.mag).toBeCloseTo(shiftOf(openNeutral), 9);
    expect(result.current.ms).toBeGreaterThanOrEqual(0);
  });

  it('sends a change after a quiet spell at once, and holds a burst of edits until it stops', async () => {
    const posted: SolveRequest[] = [];
    const answered: SolveResponse[] = [];
    const port = (onResponse: PortListener) => countingPort(posted)((res) => (answered.push(res), onResponse(res)));
    // a long debounce, so the three edits below are certainly within it of one another
    const { result, rerender } = renderHook(({ c }) => useLiveSolve(c, { createPort: port, debounceMs: 60_000 }), { initialProps: { c: withHeater(1) } });
    expect(posted).toHaveLength(1); // the first change: no wait
    rerender({ c: withHeater(2) });
    rerender({ c: withHeater(3) });
    rerender({ c: withHeater(7) });
    await waitFor(() => expect(answered).toHaveLength(1));
    expect(posted).toHaveLength(1); // the burst waits for quiet
    expect(result.current.status).toBe('solving'); // the answer to the first change is dropped: a newer edit is pending
    expect(result.current.result).toBeUndefined();
  });

  it('a burst ends in one request for its last edit', async () => {
    const posted: SolveRequest[] = [];
    const { result, rerender } = renderHook(({ c }) => useLiveSolve(c, { createPort: countingPort(posted), debounceMs: 30 }), { initialProps: { c: withHeater(1) } });
    rerender({ c: withHeater(2) });
    rerender({ c: withHeater(3) });
    rerender({ c: withHeater(7) });
    await waitFor(() => expect(result.current.status).toBe('ok'));
    expect(posted).toHaveLength(2); // the first change at once, then the burst's last edit
    expect(posted[1].circuit).toEqual(withHeater(7));
    expect(result.current.result!.buses.find((b) => b.bus === 'HOUSE')!.neutralToEarth!.mag).toBeCloseTo(shiftOf(withHeater(7)), 9);
  });

  it('drops an answer that a newer edit has overtaken, even when it arrives last', async () => {
    // A port that holds answers until released, so the older one can be delivered after the newer one.
    const handle = createSolveHandler();
    const held: SolveResponse[] = [];
    let deliver: PortListener = () => {};
    const holdingPort = (onResponse: PortListener): SolvePort => {
      deliver = onResponse;
      return { post: (r) => held.push(handle(r)), terminate: () => {} };
    };
    const { result, rerender } = renderHook(({ c }) => useLiveSolve(c, { createPort: holdingPort, debounceMs: 1 }), { initialProps: { c: withHeater(1) } });
    await waitFor(() => expect(held).toHaveLength(1));
    rerender({ c: withHeater(8) });
    await waitFor(() => expect(held).toHaveLength(2));
    act(() => deliver(held[1]));
    act(() => deliver(held[0])); // stale: must not replace the newer result
    expect(result.current.status).toBe('ok');
    expect(result.current.result!.buses.find((b) => b.bus === 'HOUSE')!.neutralToEarth!.mag).toBeCloseTo(shiftOf(withHeater(8)), 9);
  });

  it('reports a failing edit with its typed fields and keeps the last good result marked stale', async () => {
    const { result, rerender } = renderHook(({ c }) => useLiveSolve(c, { createPort: createInThreadPort, debounceMs: 1 }), { initialProps: { c: openNeutral as unknown as CircuitInput } });
    await waitFor(() => expect(result.current.status).toBe('ok'));
    const good = result.current.result;
    const broken = { ...openNeutral, elements: [...openNeutral.elements, { type: 'switch', id: 'SW9', from: 'HOUSE.a', to: 'NOWHERE.a', closed: true }] } as CircuitInput;
    rerender({ c: broken });
    await waitFor(() => expect(result.current.status).toBe('error'));
    expect(result.current.error).toMatchObject({ code: 'invalid-circuit', elementIds: ['SW9'] });
    expect(result.current.result).toBe(good);
    expect(result.current.stale).toBe(true);
  });

  it('compares limits by value: a new but equal limits object does not solve again', async () => {
    const posted: SolveRequest[] = [];
    const { result, rerender } = renderHook(({ set }) => useLiveSolve(openNeutral, { createPort: countingPort(posted), debounceMs: 1, limits: { set } }), { initialProps: { set: 'iec-en' as const } });
    await waitFor(() => expect(result.current.status).toBe('ok'));
    rerender({ set: 'iec-en' });
    rerender({ set: 'iec-en' });
    await new Promise((r) => setTimeout(r, 20));
    expect(posted).toHaveLength(1);
    expect(result.current.result!.limits.id).toBe('iec-en');
  });

  it('is idle with nothing to solve', () => {
    const { result } = renderHook(() => useLiveSolve(null, { createPort: createInThreadPort }));
    expect(result.current.status).toBe('idle');
  });
});
