/**
 * What server/cli/solve.sh runs (and so `npm run solve`): server/cli/solve.ts from its cached
 * bundle, exactly as solve-launcher.mjs does, but as a CommonJS entry, so node starts without its
 * ES module loader (see launcher.cjs).
 */
'use strict';
require('./launcher.cjs').launch('solve');
