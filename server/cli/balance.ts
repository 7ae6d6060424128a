/**
 * `npm run -s balance -- <customers.csv> --feeder <f.json> [--objective neutral|unbalance|losses|voltage|mix]
 * [--weights neutral=1,unbalance=1,losses=2,voltage=1] [--definition iec|nema|ieee] [--bus <name>] [--max-moves N] [--moves-csv <file>] [--json]`:
 * phase balancing of the customers in the CSV (columns customer,bus,phase,kw,kvar|pf, optional
 * fixed, model, phases) on the feeder circuit file, each customer added as a single-phase load
 * between its phase and the neutral of its bus (see shared/engine/balancing). The weighted mix
 * (`--objective mix --weights …`) scores Σ weight × term / term before balancing; `--definition`
 * chooses the unbalance of its unbalance term.
 *
 * Text by default: the move list for the crew with the caution, then before / after / rotating-rule
 * figures and the gap the MILP proved. With --json:
 * `{ "objective", "assignment": { customer: phase }, "moves": [ { customer, bus, from, to } ],
 *   "before": { neutralCurrentA, maxUnbalancePercent: { iec, nema, ieee }, lossesKw,
 *   minCustomerVoltagePu, maxCustomerVoltagePu }, "after": {…}, "rotatingRule": {…}, "gapPercent" }`,
 * the caution on stderr. Every figure comes from an exact solve of that assignment.
 * Exit codes: 0 done; 2 invalid input (options, files, customer list, feeder); 3 the engine could
 * not solve the feeder.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import {
  BALANCE_OBJECTIVES,
  CustomerListError,
  EngineError,
  FIGURE_ROWS,
  MOVES_CAUTION,
  balancePhases,
  issueText,
  movesCsv,
  objectiveWords,
  parseCustomersCsv,
  type BalanceResult,
  type Customer,
  type ObjectiveSpec,
} from '../../shared/engine/index.ts';
import { highsRuntime } from '../work/highs.ts';

const USAGE = 'usage: balance <customers.csv> --feeder <f.json> [--objective neutral|unbalance|losses|voltage|mix] [--weights neutral=1,unbalance=1,losses=2,voltage=1] [--definition iec|nema|ieee] [--bus <name>] [--max-moves N] [--moves-csv <file>] [--json]';

function fail(code: number, message: string): never {
  process.stderr.write(`balance: ${message.split('\n')[0]}\n`);
  process.exit(code);
}

interface Args {
  csv: string;
  feeder: string;
  spec: ObjectiveSpec;
  bus?: string;
  maxMoves?: number;
  movesCsv?: string;
  json: boolean;
}

/** `neutral=1,unbalance=1,losses=2,voltage=1` → the weights of the mix; throws an Error in words. */
export function parseWeights(text: string): NonNullable<ObjectiveSpec['weights']> {
  const terms = ['neutral', 'unbalance', 'losses', 'voltage'] as const;
  const weights: NonNullable<ObjectiveSpec['weights']> = {};
  for (const part of text.split(',')) {
    const [name, value, ...rest] = part.split('=').map((s) => s.trim());
    const term = terms.find((t) => t === name);
    if (!term) throw new Error(`--weights: "${name}" is not a term of the mix (use neutral, unbalance, losses or voltage, e.g. neutral=1,losses=2)`);
    if (value === undefined || value === '' || rest.length > 0) throw new Error(`--weights: give ${term} a number, as in ${term}=1`);
    const w = Number(value);
    if (!Number.isFinite(w)) throw new Error(`--weights: the ${term} weight must be a number (got "${value}")`);
    if (w < 0) throw new Error(`--weights: the ${term} weight cannot be negative (got ${value})`);
    if (weights[term] !== undefined) throw new Error(`--weights: ${term} is given twice`);
    weights[term] = w;
  }
  if (!Object.values(weights).some((w) => w > 0)) throw new Error('--weights: give at least one weight above zero');
  return weights;
}

/** Parse the command line; throws an Error with the message for the user. */
export function parseArgs(argv: string[]): Args {
  const values: Record<string, string> = {};
  const positional: string[] = [];
  let json = false;
  const named = ['--feeder', '--objective', '--weights', '--definition', '--bus', '--max-moves', '--moves-csv'];
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--json') {
      json = true;
      continue;
    }
    const name = named.find((n) => a === n || a.startsWith(`${n}=`));
    if (name) {
      const v = a.length > name.length ? a.slice(name.length + 1) : argv[++i];
      if (v === undefined || v === '' || v.startsWith('--')) throw new Error(`${name} needs a value (${USAGE})`);
      values[name] = v;
    } else if (a.startsWith('--')) throw new Error(`unknown option ${a} (${USAGE})`);
    else positional.push(a);
  }
  if (positional.length !== 1) throw new Error(USAGE);
  if (!values['--feeder']) throw new Error(`give the feeder circuit file with --feeder (${USAGE})`);
  const objective = (values['--objective'] ?? 'neutral') as ObjectiveSpec['objective'];
  if (!(BALANCE_OBJECTIVES as readonly string[]).includes(objective)) throw new Error(`--objective must be neutral, unbalance, losses, voltage or mix (got "${values['--objective']}")`);
  const definition = values['--definition'] as ObjectiveSpec['definition'] | undefined;
  if (definition !== undefined && !['iec', 'nema', 'ieee'].includes(definition)) throw new Error(`--definition must be iec, nema or ieee (got "${definition}")`);
  if (definition !== undefined && objective !== 'unbalance' && objective !== 'mix') throw new Error('--definition goes with --objective unbalance or mix');
  if (objective === 'mix' && values['--weights'] === undefined) throw new Error('--objective mix needs --weights, e.g. --weights neutral=1,unbalance=1,losses=2,voltage=1');
  if (objective !== 'mix' && values['--weights'] !== undefined) throw new Error('--weights goes with --objective mix');
  const weights = objective === 'mix' ? parseWeights(values['--weights']) : undefined;
  let maxMoves: number | undefined;
  if (values['--max-moves'] !== undefined) {
    maxMoves = Number(values['--max-moves']);
    if (!Number.isInteger(maxMoves) || maxMoves < 0) throw new Error(`--max-moves must be a whole number ≥ 0 (got "${values['--max-moves']}")`);
  }
  return { csv: positional[0], feeder: values['--feeder'], spec: { objective, ...(definition ? { definition } : {}), ...(weights ? { weights } : {}) }, bus: values['--bus'], maxMoves, movesCsv: values['--moves-csv'], json };
}

/** The JSON the CLI prints (the issue's shape). */
export function balanceJson(r: BalanceResult) {
  return { objective: r.objective.objective, assignment: r.assignment, moves: r.moves, before: r.before, after: r.after, rotatingRule: r.rotatingRule, gapPercent: r.gapPercent };
}

const pad = (s: string, n: number) => (s.length >= n ? s : s + ' '.repeat(n - s.length));
const lpad = (s: string, n: number) => (s.length >= n ? s : ' '.repeat(n - s.length) + s);

/** The readable report. */
export function balanceText(r: BalanceResult): string {
  const out: string[] = [];
  out.push(`Phase balancing: minimise the ${objectiveWords(r)}; at most ${r.maxMoves} move${r.maxMoves === 1 ? '' : 's'}`);
  out.push(MOVES_CAUTION);
  out.push('');
  if (r.moves.length === 0) out.push('No move improves on the present connection.');
  else {
    out.push(`Moves for the crew (${r.moves.length}):`);
    const w = Math.max(8, ...r.moves.map((m) => m.customer.length));
    const wb = Math.max(3, ...r.moves.map((m) => m.bus.length));
    out.push(`  ${pad('customer', w)}  ${pad('bus', wb)}  from → to`);
    for (const m of r.moves) out.push(`  ${pad(m.customer, w)}  ${pad(m.bus, wb)}  ${m.from} → ${m.to}`);
  }
  out.push('');
  out.push(`${pad('', 42)}${lpad('before', 10)}${lpad('after', 10)}${lpad('rotating rule', 15)}`);
  for (const row of FIGURE_ROWS) {
    out.push(`${pad(`${row.label} (${row.unit})`, 42)}${lpad(row.get(r.before).toFixed(row.digits), 10)}${lpad(row.get(r.after).toFixed(row.digits), 10)}${lpad(row.get(r.rotatingRule).toFixed(row.digits), 15)}`);
  }
  out.push('');
  const unit = { neutral: ' A', unbalance: ' %', losses: ' kW', voltage: ' pu', mix: '' }[r.objective.objective];
  const gap = Number.isFinite(r.gapPercent) ? `${r.gapPercent.toFixed(3)} % (${r.milp.absoluteGap.toPrecision(3)}${unit} between its solution and its bound; ${r.milp.status})` : `none (no MILP solution: ${r.milp.status})`;
  out.push(`Every figure is from an exact solve of that assignment; ${r.solves} exact solves.`);
  out.push(`Gap proved by the MILP on the linearised model: ${gap}.`);
  out.push('');
  return out.join('\n');
}

/** Run the balance CLI on its arguments (exits the process on errors). */
export async function main(argv: string[]): Promise<void> {
  let args: Args;
  try {
    args = parseArgs(argv);
  } catch (e) {
    fail(2, (e as Error).message);
  }
  const read = (file: string) => {
    try {
      return readFileSync(file, 'utf8');
    } catch (e) {
      fail(2, `cannot read ${file}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
    }
  };
  const csvText = read(args.csv);
  const feederText = read(args.feeder);
  let feeder: unknown;
  try {
    feeder = JSON.parse(feederText);
  } catch (e) {
    fail(2, `${args.feeder} is not valid JSON: ${(e as Error).message}`);
  }
  let customers: Customer[];
  try {
    customers = parseCustomersCsv(csvText);
  } catch (e) {
    if (e instanceof CustomerListError) {
      process.stderr.write(`balance: ${args.csv} has ${e.issues.length} problem${e.issues.length > 1 ? 's' : ''}:\n${e.issues.slice(0, 20).map((i) => `  ${issueText(i)}\n`).join('')}${e.issues.length > 20 ? `  … and ${e.issues.length - 20} more\n` : ''}`);
      process.exit(2);
    }
    throw e;
  }
  const highs = await highsRuntime();
  let result: BalanceResult;
  try {
    result = balancePhases(highs, feeder, customers, { objective: args.spec, bus: args.bus, maxMoves: args.maxMoves });
  } catch (e) {
    if (e instanceof CustomerListError) {
      process.stderr.write(`balance: the customers do not fit the feeder:\n${e.issues.slice(0, 20).map((i) => `  ${issueText(i)}\n`).join('')}`);
      process.exit(2);
    }
    if (e instanceof EngineError) fail(e.code === 'invalid-circuit' ? 2 : 3, `${args.feeder}: ${e.message}`);
    throw e;
  }
  if (args.movesCsv) {
    try {
      writeFileSync(args.movesCsv, movesCsv(result.moves));
    } catch (e) {
      fail(2, `cannot write ${args.movesCsv}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
    }
  }
  if (args.json) {
    process.stderr.write(`${MOVES_CAUTION}\n`);
    process.stdout.write(`${JSON.stringify(balanceJson(result), null, 2)}\n`);
  } else process.stdout.write(balanceText(result));
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) void main(process.argv.slice(2));
