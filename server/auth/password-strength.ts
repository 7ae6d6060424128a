/**
 * Password strength with zxcvbn-ts and the common-passwords and words lists it ships
 * (@zxcvbn-ts/language-common). A password must reach score 3 of 4 ("safely unguessable:
 * moderate protection from offline slow-hash attacks" in zxcvbn's terms), judged together with the
 * person's own name, e-mail and team name, which make a guess easier. The dictionaries are loaded
 * on the first check, not at start, so an idle server does not carry them.
 */
import { ZxcvbnFactory } from '@zxcvbn-ts/core';

/** Lowest accepted zxcvbn score (0–4). */
export const MIN_SCORE = 3;

let factory: Promise<ZxcvbnFactory> | null = null;

function load(): Promise<ZxcvbnFactory> {
  factory ??= import('@zxcvbn-ts/language-common').then(
    ({ adjacencyGraphs, dictionary }) => new ZxcvbnFactory({ dictionary: { ...dictionary }, graphs: adjacencyGraphs }),
  );
  return factory;
}

/** zxcvbn's warning keys, in our words. */
const WARNINGS: Record<string, string> = {
  straightRow: 'Straight rows of keys on the keyboard are easy to guess',
  keyPattern: 'Short keyboard patterns are easy to guess',
  simpleRepeat: 'Repeated characters like "aaa" are easy to guess',
  extendedRepeat: 'Repeated patterns like "abcabcabc" are easy to guess',
  sequences: 'Sequences like "abc" or "6543" are easy to guess',
  recentYears: 'Recent years are easy to guess',
  dates: 'Dates are easy to guess',
  topTen: 'This is one of the most used passwords',
  topHundred: 'This is a very often used password',
  common: 'This is a commonly used password',
  similarToCommon: 'This is too close to a commonly used password',
  wordByItself: 'A single word is easy to guess',
  namesByThemselves: 'Names or surnames on their own are easy to guess',
  commonNames: 'Common names and surnames are easy to guess',
  userInputs: 'Do not build the password from your name, e-mail or team name',
  pwned: 'This password has appeared in a data breach',
};

/** Null when the password is strong enough, else a message saying why and what to do. */
export async function passwordWeakness(password: string, userInputs: string[] = []): Promise<string | null> {
  const z = await load();
  const inputs = userInputs.flatMap((s) => [s, ...s.split(/[\s@.+_-]+/)]).filter((s) => s.length >= 3);
  const result = z.check(password, inputs);
  if (result.score >= MIN_SCORE) return null;
  const why = (result.feedback.warning && WARNINGS[result.feedback.warning]) || 'This password is too easy to guess';
  return `${why}. Use a longer passphrase of several unrelated words.`;
}
