import { act, renderHook, waitFor } from '@testing-library/react';
import { useState } from 'react';
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit, type CircuitInput } from '../../../../../shared/engine/index.ts';
import { createSolveHandler } from '../../../../../src/features/workspace/solve/solve-handler.ts';
import { createInThreadPort, type PortListener, type SolvePort } from '../../../../../src/features/workspace/solve/solve-port.ts';
import type { SolveRequest, SolveResponse } from '../../../../../src/features/workspace/solve/solve-protocol.ts';
import { useLiveSolve, type LiveSolveOptions } from '../../../../../src/features/workspace/solve/use-live-solve.ts';

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

  describe('solveAhead: an edit solved before it is drawn', () => {
    /** The circuit lives in state (as the workspace document does); every render's circuit and status is recorded. */
    function useHarness(initial: CircuitInput, options: LiveSolveOptions, seen: { c: CircuitInput; status: string }[]) {
      const [c, setC] = useState(initial);
      const live = useLiveSolve(c, options);
      seen.push({ c, status: live.status });
      return { c, setC, live };
    }
    /** A port that answers only when told (`release`), with the real handler. */
    function manualPort(posted: SolveRequest[]) {
      const handle = createSolveHandler();
      const out = { deliver: (() => {}) as PortListener, release: (i: number) => out.deliver(handle(posted[i])) };
      const create = (onResponse: PortListener): SolvePort => {
        out.deliver = onResponse;
        return { post: (r) => void posted.push(r), terminate: () => {} };
      };
      return { out, create };
    }

    it('draws the edit only together with its answer: no render shows it unsolved, and it is posted once', async () => {
      const posted: SolveRequest[] = [];
      const seen: { c: CircuitInput; status: string }[] = [];
      const { result } = renderHook(() => useHarness(withHeater(1), { createPort: countingPort(posted), debounceMs: 1 }, seen));
      await waitFor(() => expect(result.current.live.status).toBe('ok'));
      const next = withHeater(6);
      let commits = 0;
      act(() => result.current.live.solveAhead(next, () => (commits++, result.current.setC(next))));
      expect(commits).toBe(0); // held until the answer
      expect(result.current.c).not.toBe(next);
      await waitFor(() => expect(result.current.c).toBe(next));
      expect(commits).toBe(1);
      expect(result.current.live.status).toBe('ok');
      expect(result.current.live.result!.buses.find((b) => b.bus === 'HOUSE')!.neutralToEarth!.mag).toBeCloseTo(shiftOf(next), 9);
      expect(seen.filter((s) => s.c === next).map((s) => s.status)).not.toContain('solving');
      await new Promise((r) => setTimeout(r, 20));
      expect(posted).toHaveLength(2); // the render that shows the edit took the request sent ahead
      expect(posted[1].circuit).toBe(next);
    });

    it('draws the edit without its answer when the answer is late, and the answer when it comes', async () => {
      const posted: SolveRequest[] = [];
      const { out, create } = manualPort(posted);
      const seen: { c: CircuitInput; status: string }[] = [];
      const { result } = renderHook(() => useHarness(withHeater(1), { createPort: create, debounceMs: 1 }, seen));
      await waitFor(() => expect(posted).toHaveLength(1));
      act(() => out.release(0));
      expect(result.current.live.status).toBe('ok');
      const next = withHeater(4);
      act(() => result.current.live.solveAhead(next, () => result.current.setC(next)));
      expect(posted).toHaveLength(2);
      // No answer: the edit is committed by the deadline (at most 250 ms), shown as solving.
      await waitFor(() => expect(result.current.c).toBe(next), { timeout: 1000 });
      expect(result.current.live.status).toBe('solving');
      expect(posted).toHaveLength(2);
      act(() => out.release(1));
      expect(result.current.live.status).toBe('ok');
      expect(result.current.live.result!.buses.find((b) => b.bus === 'HOUSE')!.neutralToEarth!.mag).toBeCloseTo(shiftOf(next), 9);
    });

    it('draws the edit at once, its request already sent, when recent solves took the worker long', async () => {
      const posted: SolveRequest[] = [];
      const { out, create } = manualPort(posted);
      const { result } = renderHook(() => useHarness(withHeater(1), { createPort: create, debounceMs: 1 }, []));
      await waitFor(() => expect(posted).toHaveLength(1));
      const handle = createSolveHandler();
      act(() => out.deliver({ ...handle(posted[0]), ms: 120 })); // as a large study's solve would report
      const next = withHeater(5);
      let commits = 0;
      act(() => result.current.live.solveAhead(next, () => (commits++, result.current.setC(next))));
      expect(commits).toBe(1); // not held
      expect(result.current.c).toBe(next);
      expect(result.current.live.status).toBe('solving');
      await new Promise((r) => setTimeout(r, 20));
      expect(posted).toHaveLength(2); // sent before the render, which took it
      act(() => out.release(1));
      expect(result.current.live.status).toBe('ok');
      expect(result.current.live.result!.buses.find((b) => b.bus === 'HOUSE')!.neutralToEarth!.mag).toBeCloseTo(shiftOf(next), 9);
    });

    it('keeps edits in order: another change commits the held edit first (flushAhead)', async () => {
      const posted: SolveRequest[] = [];
      const { out, create } = manualPort(posted);
      const { result } = renderHook(() => useHarness(withHeater(1), { createPort: create, debounceMs: 1 }, []));
      await waitFor(() => expect(posted).toHaveLength(1));
      act(() => out.release(0));
      const order: string[] = [];
      const a = withHeater(2);
      const b = withHeater(3);
      act(() => result.current.live.solveAhead(a, () => (order.push('a'), result.current.setC(a))));
      act(() => result.current.live.solveAhead(b, () => (order.push('b'), result.current.setC(b))));
      expect(order).toEqual(['a']); // the first edit was committed when the second came
      act(() => out.release(1)); // the answer to the first edit: overtaken, dropped
      expect(result.current.c).toBe(a);
      act(() => out.release(2));
      expect(order).toEqual(['a', 'b']);
      expect(result.current.c).toBe(b);
      expect(result.current.live.status).toBe('ok');
      expect(result.current.live.result!.buses.find((x) => x.bus === 'HOUSE')!.neutralToEarth!.mag).toBeCloseTo(shiftOf(b), 9);
      act(() => result.current.live.flushAhead()); // nothing held: nothing happens
      expect(order).toEqual(['a', 'b']);
    });
  });
});
