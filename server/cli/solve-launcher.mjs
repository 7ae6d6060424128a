/**
 * What `npm run solve` runs: `node server/cli/solve-launcher.mjs <file.json> [--json [--full]] [--case <id> | --all-cases]`,
 * server/cli/solve.ts from its cached bundle (see launcher.cjs for how and why).
 */
import { launch } from './launcher.cjs';

await launch('solve');
