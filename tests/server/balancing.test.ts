/**
 * POST /api/studies/:id/balance: balancing a study's own single-phase loads or an uploaded customer
 * list in the worker pool, errors in words, the team boundary, and "Apply" as a new revision
 * through the ordinary save (PATCH) with the engine's applyAssignment.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type TestAgent from 'supertest/lib/agent.js';
import { analyseFeeder, applyAssignment, balanceScore, exactFigures, mixNormalisers, neutralPoint, parseCustomersCsv, solveAssignment, withCustomers, type CircuitInput, type ObjectiveSpec } from '../../shared/engine/index.ts';
import { balanceResponseSchema } from '../../shared/api/balancing.ts';
import { closeDb, type Db } from '../../server/db/index.ts';
import { closeWork, configureWork } from '../../server/work/index.ts';
import { makeApp, makeTeam, makeUser, signedIn } from './helpers.ts';
import { openTestDb } from './test-db.ts';
import { smallCustomers, smallFeeder } from '../shared/engine/balancing/small-feeder.ts';

let db: Db;
let engineer: TestAgent;
let viewer: TestAgent;
let stranger: TestAgent;
let feederStudy: string;
let loadsStudy: { id: string; version: number };

// the study whose own loads are balanced: the small feeder with its customers drawn as loads
const withLoads = withCustomers(analyseFeeder(smallFeeder), smallCustomers, Object.fromEntries(smallCustomers.map((c) => [c.customer, c.phase]))) as CircuitInput;

beforeAll(async () => {
  db = await openTestDb();
  const t = makeApp(db);
  configureWork({ threads: 1, timeoutMs: 120_000 });
  const team = await makeTeam(db);
  engineer = await signedIn(t.app, (await makeUser(db, team, 'engineer')).email);
  viewer = await signedIn(t.app, (await makeUser(db, team, 'viewer')).email);
  stranger = await signedIn(t.app, (await makeUser(db, await makeTeam(db), 'owner')).email);
  feederStudy = (await engineer.post('/api/studies').send({ name: 'Lane feeder', content: { circuit: smallFeeder } })).body.id;
  loadsStudy = (await engineer.post('/api/studies').send({ name: 'Lane houses', content: { circuit: withLoads } })).body;
});
afterAll(async () => {
  await closeWork();
  await closeDb(db);
});

const CSV = 'customer,bus,phase,kw,kvar\nH1,P1,A,4.2,1.0\nH2,P1,A,2.5,0.6\nH3,P2,A,6.0,1.5\nH5,P3,A,3.4,0.9\nH7,P3,C,0.8,0.2\n';

describe('balancing a study', () => {
  it('balances an uploaded customer list (any team member may run it), with the caution and exact figures', async () => {
    const res = await viewer.post(`/api/studies/${feederStudy}/balance`).send({ customersCsv: CSV, objective: 'neutral', maxMoves: 2 });
    expect(res.status).toBe(200);
    const body = balanceResponseSchema.parse(res.body);
    expect(body.moves.length).toBeGreaterThan(0);
    expect(body.moves.length).toBeLessThanOrEqual(2);
    expect(body.after.neutralCurrentA).toBeLessThan(body.before.neutralCurrentA);
    expect(body.caution).toMatch(/live equipment/);
    expect(body.fromStudy).toBe(false);
    expect(body.objective).toBe('neutral current leaving bus S');
  });

  it('names the row and column of a bad customer list (400)', async () => {
    const res = await engineer.post(`/api/studies/${feederStudy}/balance`).send({ customersCsv: 'customer,bus,phase,kw,kvar\nH1,P1,A,two,0\nH2,P9,B,1,0\n' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toContain('row 2, column kw: kW must be a number (found "two")');
    expect(res.body.error.fields.customersCsv).toBeDefined();
    const bus = await engineer.post(`/api/studies/${feederStudy}/balance`).send({ customersCsv: 'customer,bus,phase,kw,kvar\nH2,P9,B,1,0\n' });
    expect(bus.status).toBe(400);
    expect(bus.body.error.message).toContain('row 2, column bus: the feeder has no three-phase bus "P9"');
    const none = await engineer.post(`/api/studies/${feederStudy}/balance`).send({});
    expect(none.status).toBe(400);
    expect(none.body.error.message).toBe("The study's loads cannot be balanced: the study has no single-phase kW loads between a phase and the neutral to balance.");
    expect(none.body.error.fields).toBeUndefined(); // no customer list was sent
    const where = await engineer.post(`/api/studies/${feederStudy}/balance`).send({ customersCsv: CSV, bus: 'NOWHERE' });
    expect(where.status).toBe(400);
    expect(where.body.error.message).toMatch(/^The study cannot be balanced: the feeder has no bus "NOWHERE" to measure the neutral current at; its buses are \S/);
    expect(where.body.error.fields).toEqual({ bus: expect.any(String) });
    const objective = await engineer.post(`/api/studies/${feederStudy}/balance`).send({ customersCsv: CSV, objective: 'cost' });
    expect(objective.status).toBe(400);
  });

  it('balances a weighted mix: exact figures, a mix score no worse than before, the objective in words', async () => {
    const weights = { neutral: 1, unbalance: 1, losses: 2, voltage: 1 };
    const res = await engineer.post(`/api/studies/${feederStudy}/balance`).send({ customersCsv: CSV, objective: 'mix', weights, definition: 'nema', maxMoves: 2 });
    expect(res.status).toBe(200);
    const body = balanceResponseSchema.parse(res.body);
    expect(body.moves.length).toBeGreaterThan(0);
    expect(body.moves.length).toBeLessThanOrEqual(2);
    // every figure is an exact solve of its assignment, solved again here (C)
    const feeder = analyseFeeder(smallFeeder);
    const customers = parseCustomersCsv(CSV);
    const exact = (a: Record<string, 'A' | 'B' | 'C'>) => {
      const r = solveAssignment(feeder, customers, a);
      return exactFigures(r, customers, neutralPoint(feeder, r)).figures;
    };
    const before = exact(Object.fromEntries(customers.map((c) => [c.customer, c.phase])));
    const after = exact(body.assignment);
    expect(body.before.lossesKw).toBeCloseTo(before.lossesKw, 9);
    expect(body.after.neutralCurrentA).toBeCloseTo(after.neutralCurrentA, 9);
    expect(body.after.maxUnbalancePercent.nema).toBeCloseTo(after.maxUnbalancePercent.nema, 9);
    expect(body.after.minCustomerVoltagePu).toBeCloseTo(after.minCustomerVoltagePu, 9);
    // the mix score by the engine's own score function: after ≤ before
    const spec: ObjectiveSpec = { objective: 'mix', definition: 'nema', weights };
    const norm = mixNormalisers(before, spec);
    expect(balanceScore(before, spec, norm)).toBeCloseTo(weights.neutral + weights.unbalance + weights.losses + weights.voltage, 9); // each term relative to itself: Σ weights (P)
    expect(balanceScore(after, spec, norm)).toBeLessThanOrEqual(balanceScore(before, spec, norm) + 1e-9);
    expect(body.objective).toBe(
      'weighted mix of the neutral current leaving bus S (weight 1), the worst voltage unbalance along the feeder (line voltages, NEMA) (weight 1), the losses (weight 2) and the drop of the lowest customer voltage below 1 pu (weight 1), each relative to its value before balancing',
    );
  });

  it('says what is wrong with the weights of a mix (400)', async () => {
    const send = (body: object) => engineer.post(`/api/studies/${feederStudy}/balance`).send({ customersCsv: CSV, ...body });
    const negative = await send({ objective: 'mix', weights: { neutral: -1, losses: 1 } });
    expect(negative.status).toBe(400);
    expect(negative.body.error.message).toContain('The neutral current weight cannot be negative');
    const none = await send({ objective: 'mix' });
    expect(none.status).toBe(400);
    expect(none.body.error.message).toContain('Give the weighted mix at least one weight above zero.');
    const zeros = await send({ objective: 'mix', weights: { neutral: 0, losses: 0 } });
    expect(zeros.status).toBe(400);
    expect(zeros.body.error.fields.weights).toBe('Give the weighted mix at least one weight above zero.');
    const text = await send({ objective: 'mix', weights: { losses: 'two' } });
    expect(text.status).toBe(400);
    expect(text.body.error.message).toContain('The losses weight must be a number');
    const unknown = await send({ objective: 'mix', weights: { cost: 1 } });
    expect(unknown.status).toBe(400);
    const notMix = await send({ objective: 'losses', weights: { losses: 1 } });
    expect(notMix.status).toBe(400);
    expect(notMix.body.error.message).toContain('Weights go with the weighted mix objective only.');
    const definition = await send({ objective: 'losses', definition: 'ieee' });
    expect(definition.status).toBe(400);
  });

  it('is 404 for another team', async () => {
    const res = await stranger.post(`/api/studies/${feederStudy}/balance`).send({ customersCsv: CSV });
    expect(res.status).toBe(404);
  });

  it("balances the study's own loads and applies the moves as a new revision", async () => {
    const res = await engineer.post(`/api/studies/${loadsStudy.id}/balance`).send({ objective: 'losses', maxMoves: 3 });
    expect(res.status).toBe(200);
    const body = balanceResponseSchema.parse(res.body);
    expect(body.fromStudy).toBe(true);
    expect(body.moves.length).toBeGreaterThan(0);
    expect(body.moves.length).toBeLessThanOrEqual(3);
    const content = { circuit: applyAssignment(withLoads, body.assignment) };
    const saved = await engineer.patch(`/api/studies/${loadsStudy.id}`).send({ version: loadsStudy.version, content, message: `Phase balancing: ${body.moves.length} moves` });
    expect(saved.status).toBe(200);
    expect(saved.body.revision).toBe(2);
    const moved = body.moves[0];
    const load = (saved.body.content.circuit.elements as { id: string; between?: string[] }[]).find((e) => e.id === moved.customer)!;
    expect(load.between).toEqual([moved.to.toLowerCase(), 'n']);
  });
});

describe('balancing with progress (Accept: application/x-ndjson)', () => {
  // the whole streamed body as text (supertest does not buffer this content type by itself)
  const ndjson = (agent: TestAgent, id: string, body: object) =>
    agent
      .post(`/api/studies/${id}/balance`)
      .set('Accept', 'application/x-ndjson')
      .buffer(true)
      .parse((r, done) => {
        let text = '';
        r.setEncoding('utf8');
        r.on('data', (chunk: string) => (text += chunk));
        r.on('end', () => done(null, text));
      })
      .send(body);

  it('streams progress lines, then the same answer as the JSON mode', async () => {
    const input = { customersCsv: CSV, objective: 'neutral', maxMoves: 2 };
    const res = await ndjson(viewer, feederStudy, input);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^application\/x-ndjson/);
    const text = res.body as string;
    expect(text.endsWith('\n')).toBe(true);
    const lines = text.trimEnd().split('\n').map((l) => JSON.parse(l) as Record<string, unknown>);
    const last = lines.at(-1)!;
    expect(Object.keys(last)).toEqual(['result']);
    const progress = lines.slice(0, -1);
    expect(progress.length).toBeGreaterThan(0);
    for (const l of progress) {
      expect(Object.keys(l)).toEqual(['progress']);
      const p = l.progress as { stage: string; solves: number };
      expect(['solving', 'linearising', 'milp', 'local-search', 'done']).toContain(p.stage);
      expect(Number.isInteger(p.solves) && p.solves >= 0).toBe(true);
    }
    // the solves counted never go down, and the job got past its first stage (P)
    const solves = progress.map((l) => (l.progress as { solves: number }).solves);
    expect(solves).toEqual([...solves].sort((a, b) => a - b));
    expect(new Set(progress.map((l) => (l.progress as { stage: string }).stage)).size).toBeGreaterThan(1);
    const streamed = balanceResponseSchema.parse(last.result);
    const plain = await viewer.post(`/api/studies/${feederStudy}/balance`).send(input);
    expect(plain.status).toBe(200);
    expect(plain.headers['content-type']).toMatch(/^application\/json/);
    const json = balanceResponseSchema.parse(plain.body);
    expect(Object.keys(last.result as object).sort()).toEqual(Object.keys(plain.body as object).sort());
    expect(streamed.before).toEqual(json.before);
    expect(streamed.objective).toBe(json.objective);
    expect(streamed.moves.length).toBeLessThanOrEqual(2);
  });

  it('still answers bad input with a 4xx JSON error before any streaming', async () => {
    const bad = await engineer
      .post(`/api/studies/${feederStudy}/balance`)
      .set('Accept', 'application/x-ndjson')
      .send({ customersCsv: 'customer,bus,phase,kw,kvar\nH1,P1,A,two,0\n' });
    expect(bad.status).toBe(400);
    expect(bad.headers['content-type']).toMatch(/^application\/json/);
    expect(bad.body.error.code).toBe('validation');
    expect(bad.body.error.message).toContain('row 2, column kw: kW must be a number (found "two")');
    const objective = await engineer.post(`/api/studies/${feederStudy}/balance`).set('Accept', 'application/x-ndjson').send({ customersCsv: CSV, objective: 'cost' });
    expect(objective.status).toBe(400);
    expect(objective.body.error.code).toBe('validation');
    const foreign = await stranger.post(`/api/studies/${feederStudy}/balance`).set('Accept', 'application/x-ndjson').send({ customersCsv: CSV });
    expect(foreign.status).toBe(404);
    expect(foreign.body.error.code).toBe('not-found');
  });
});
