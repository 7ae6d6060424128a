/**
 * What `npm run balance` runs: `node server/cli/balance-launcher.mjs <customers.csv> --feeder <f.json> …`,
 * server/cli/balance.ts from its cached bundle (see launcher.cjs for how and why).
 */
import { launch } from './launcher.cjs';

await launch('balance');
