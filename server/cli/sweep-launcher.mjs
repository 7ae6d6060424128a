/**
 * What `npm run sweep` runs: `node server/cli/sweep-launcher.mjs <file.json> --set <path>=<from>:<to>:<steps> …`,
 * server/cli/sweep.ts from its cached bundle (see launcher.cjs for how and why).
 */
import { launch } from './launcher.cjs';

await launch('sweep');
