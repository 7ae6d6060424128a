import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit } from '../../../../../shared/engine/index.ts';
import { errorFor, useBusOverlay, useElementError, useElementOverlay, WorkspaceResultsProvider } from '../../../../../src/features/workspace/results/results-context.tsx';
import type { LiveSolveState } from '../../../../../src/features/workspace/solve/use-live-solve.ts';

function Probe({ bus, element }: { bus: string; element: string }) {
  const b = useBusOverlay(bus);
  const e = useElementOverlay(element);
  const err = useElementError(element);
  return (
    <p>
      shift={b?.neutralShiftV?.toFixed(2) ?? 'none'} currents={e?.currents.length ?? 'none'} error={err?.code ?? 'none'}
    </p>
  );
}

describe('WorkspaceResultsContext', () => {
  const result = solveCircuit(demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit);

  it('gives canvas nodes the overlays of the live result', () => {
    const solve: LiveSolveState = { status: 'ok', result };
    render(
      <WorkspaceResultsProvider solve={solve} standard="north-american">
        <Probe bus="HOUSE" element="KITCHEN" />
      </WorkspaceResultsProvider>,
    );
    // Engine value: 56.84 V neutral-to-earth at HOUSE; KITCHEN carries a and n currents.
    expect(screen.getByText(/shift=56\.84 currents=2 error=none/)).toBeInTheDocument();
  });

  it('shows an engine error only beside the element (or bus) it names', () => {
    const error = { code: 'ill-posed-network', message: 'source XFMR-SEC is shorted by switch SW1', elementIds: ['SW1'], nodes: ['HOUSE.n'] };
    const solve: LiveSolveState = { status: 'error', result, error, stale: true };
    render(
      <WorkspaceResultsProvider solve={solve} standard="iec-60445">
        <Probe bus="HOUSE" element="SW1" />
        <Probe bus="PAD" element="KITCHEN" />
      </WorkspaceResultsProvider>,
    );
    expect(screen.getByText(/currents=none error=ill-posed-network/)).toBeInTheDocument();
    expect(screen.getByText(/currents=2 error=none/)).toBeInTheDocument();
    expect(errorFor(error, 'HOUSE')).toBe(error); // a named node HOUSE.n concerns bus HOUSE
    expect(errorFor(error, 'HOUS')).toBeUndefined();
    expect(errorFor(undefined, 'SW1')).toBeUndefined();
  });
});
