/** The four invented demo circuits, for seeding studies and for tests. */
import type { CircuitInput } from '../schema/circuit.ts';
import { deltaWyeBank } from './delta-wye-bank.ts';
import { feederEarthFault } from './feeder-earth-fault.ts';
import { openNeutralService } from './open-neutral-service.ts';
import { splitPhaseService } from './split-phase-service.ts';
import { balancingStudy } from './balancing-feeder.ts';

export interface DemoCircuit {
  /** Stable key. */
  key: string;
  name: string;
  description: string;
  circuit: CircuitInput;
}

export const demoCircuits: DemoCircuit[] = [
  { key: 'open-neutral-208y120', name: 'Open neutral on a 208Y/120 V service', description: 'Brackenfield Lane 14: unequal 120 V loads with the service neutral broken; the house neutral is held only by its earth rod.', circuit: openNeutralService },
  { key: 'split-phase-120-240', name: '120/240 V split-phase service', description: 'Oxley Ford farm: 25 kVA centre-tapped transformer with unequal legs and a 240 V load.', circuit: splitPhaseService },
  { key: 'delta-wye-bank', name: 'Delta–wye bank with unbalanced loads', description: 'Pellham Moor business park: 12.47 kV delta / 208Y/120 V bank (D-Yg) feeding unequal wye and delta loads.', circuit: deltaWyeBank },
  { key: 'feeder-earth-fault', name: 'Four-wire feeder with a line-to-earth fault', description: 'Kestrel Cross feeder 3: two Carson-modelled sections and a bolted phase-a-to-earth fault at the end.', circuit: feederEarthFault },
  { key: 'wrenfold-close-balancing', name: 'Wrenfold Close: houses to balance across phases', description: '230/400 V residential feeder, 36 single-phase houses mostly on phase A; open "Phase balancing" to find the few reconnections that help most.', circuit: balancingStudy },
];

export { deltaWyeBank, feederEarthFault, openNeutralService, splitPhaseService };
export { balancingFeeder, balancingCustomersCsv } from './balancing-feeder.ts';
