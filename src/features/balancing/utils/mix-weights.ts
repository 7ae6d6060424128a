/** The weights of the weighted mix as the planner types them, read into numbers or a form error in words. */
import { MIX_TERMS, mixWeightsProblem, type MixWeights } from '../../../../shared/api/balancing.ts';

/** The weights of a weighted mix, as typed. */
export type WeightTexts = Record<(typeof MIX_TERMS)[number][0], string>;

/** The typed weights as numbers (an empty box weighs nothing), or what is wrong in words. */
export function readWeights(texts: WeightTexts): { ok: true; weights: MixWeights } | { ok: false; message: string } {
  const weights: MixWeights = {};
  for (const [term, words] of MIX_TERMS) {
    const t = texts[term].trim();
    if (t === '') continue;
    const w = Number(t);
    if (!Number.isFinite(w)) return { ok: false, message: `The ${words} weight must be a number (found "${t}").` };
    if (w < 0) return { ok: false, message: `The ${words} weight cannot be negative.` };
    weights[term] = w;
  }
  const problem = mixWeightsProblem(weights);
  return problem ? { ok: false, message: problem } : { ok: true, weights };
}
