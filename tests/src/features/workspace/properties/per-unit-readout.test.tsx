/** The property panel's per-unit readout: a line's impedance on the study's bases, its level from the live solve. */
import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit } from '../../../../../shared/engine/index.ts';
import { PerUnitReadout } from '../../../../../src/features/workspace/properties/per-unit-readout.tsx';
import { WorkspaceResultsContext } from '../../../../../src/features/workspace/results/results-context.tsx';

const circuit = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const result = solveCircuit(circuit);
const drop = circuit.elements.find((e) => e.id === 'DROP')!;

describe('PerUnitReadout', () => {
  it('shows the line impedance in pu on the study base once the bus level is known', () => {
    render(
      <WorkspaceResultsContext.Provider value={{ status: 'ok', result, overlays: null, standard: 'north-american' } as never}>
        <PerUnitReadout element={drop} perUnit={{ baseMva: 0.5, baseKv: {} }} />
      </WorkspaceResultsContext.Provider>,
    );
    // (C) 30 m × (0.00054 + j0.0003) Ω/m over Z_base = 0.208² / 0.5 = 0.086528 Ω: 0.1872 + j0.104 pu.
    expect(screen.getByRole('group', { name: 'Impedance in per unit' })).toHaveTextContent('0.1872 + j0.104 pu (on 0.5 MVA, 0.208 kV)');
  });

  it('shows nothing before the solve gives the level', () => {
    const { container } = render(<PerUnitReadout element={drop} />);
    expect(container).toBeEmptyDOMElement();
  });
});
