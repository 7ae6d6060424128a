/**
 * The HiGHS runtime (the `highs` package, HiGHS compiled to WebAssembly) loaded in Node (CLI,
 * benchmarks, the server's worker threads): the package and its .wasm file are found through module
 * resolution, so this works both from the CLI's cached bundle (where `require` resolves from the
 * cache folder up to node_modules) and under tsx.
 */
import { createRequire } from 'node:module';
import type loadHighsType from 'highs';
import type { HighsRuntime } from '../../shared/engine/index.ts';

declare const require: NodeJS.Require | undefined;

let loading: Promise<HighsRuntime> | undefined;

/** Load HiGHS once per process. */
export function highsRuntime(): Promise<HighsRuntime> {
  const req = typeof require === 'function' ? require : createRequire(import.meta.url);
  const wasm = req.resolve('highs/runtime');
  // required at run time (its CommonJS build), not bundled: the ES build imports dynamically,
  // which the CLI's code-cached bundle cannot do
  const mod = req('highs') as typeof loadHighsType | { default: typeof loadHighsType };
  const loadHighs = typeof mod === 'function' ? mod : mod.default;
  loading ??= loadHighs({ locateFile: () => wasm }) as unknown as Promise<HighsRuntime>;
  return loading;
}
