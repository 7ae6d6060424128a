/**
 * What `npm run solve` runs: `node server/cli/solve-launcher.mjs <file.json> [--json [--full]] [--case <id> | --all-cases]`,
 * server/cli/solve.ts from its cached bundle (see launcher.mjs for how and why).
 */
import { launch } from './launcher.mjs';

await launch('solve');
