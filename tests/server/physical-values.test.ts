/**
 * Non-physical values are refused by the server as by the engine (issue 8, point 3): an import or a
 * save of a circuit with a negative resistance or negative kW on a load not marked as generation
 * answers 400 with the element named; the same load marked as generation is accepted.
 */
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, type Db } from '../../server/db/index.ts';
import { makeApp, makeTeam, makeUser, signedIn, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

const header = { format: 'wyeward-circuit', version: 1, frequencyHz: 60, name: 'Physical' };
const src = { type: 'source', id: 'SRC1', bus: 'B1', kvLL: 0.208 };
const load = { type: 'load', id: 'LOAD3', bus: 'B1', connection: 'single', between: ['a', 'n'], each: { kw: 1, kvar: 0 } };

let db: Db;
let t: TestApp;
let engineer: TestAgent;

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  const team = await makeTeam(db, 'Physical team');
  engineer = await signedIn(t.app, (await makeUser(db, team, 'engineer', 'Edda Engineer')).email);
});

afterAll(async () => {
  await closeDb(db);
});

describe('non-physical values through the API', () => {
  it('an import with a source impedance of −1+j0 Ω is refused, naming the element', async () => {
    const res = await engineer.post('/api/studies/import').send({ ...header, elements: [{ ...src, impedance: { ohms: { re: -1, im: 0 } } }, load] });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation');
    const [key, message] = Object.entries(res.body.error.fields as Record<string, string>)[0];
    expect(key).toMatch(/elements\[0\]\.impedance\.ohms$/);
    expect(message).toMatch(/negative resistance/);
    expect(message).toMatch(/SRC1/);
  });

  it('negative kW is refused unless the load is marked as generation', async () => {
    const refused = await engineer.post('/api/studies/import').send({ ...header, elements: [src, { ...load, each: { kw: -2, kvar: 0 } }] });
    expect(refused.status).toBe(400);
    expect(JSON.stringify(refused.body.error.fields)).toMatch(/LOAD3/);
    const accepted = await engineer.post('/api/studies/import').send({ ...header, elements: [src, { ...load, generation: true, each: { kw: -2, kvar: 0 } }] });
    expect(accepted.status).toBe(201);
  });

  it('a line with data per km and a length in metres (perLengthUnit) imports', async () => {
    const line = { type: 'line', id: 'TAP', from: 'B1', to: 'B2', length: 800, lengthUnit: 'm', perLengthUnit: 'km', impedance: { kind: 'sequence', z1PerLength: { re: 0.19, im: 0.38 }, z0PerLength: { re: 0.48, im: 1.25 } } };
    const res = await engineer.post('/api/studies/import').send({ ...header, elements: [src, line, { ...load, bus: 'B2' }] });
    expect(res.status).toBe(201);
  });
});
