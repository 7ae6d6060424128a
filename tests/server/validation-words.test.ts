/**
 * Validation messages speak of what people see: the error middleware's one path for request
 * problems (server/error-handler.ts → server/issue-words.ts) and the input boundary name the field
 * by the label people read ("Study name", "Role", "Diagram layout › shape 4") or say a plain
 * sentence; never a schema path (`layout.nodes.3`, `content.circuit.format`), an internal key
 * (`version`, `pageSize`) or a validator's phrasing ("Invalid input: expected number").
 * `fields` keeps its keys (paths), which the client uses to place a message at its field.
 */
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '../../server/db/index.ts';
import { APP_URL, type TestApp } from './helpers.ts';
import { closeTeamStudy, openTeamStudy, teamStudyCircuit } from './team-study.ts';

const circuit = teamStudyCircuit;

let db: Db, t: TestApp, owner: TestAgent, engineer: TestAgent, studyId: string;
beforeAll(async () => void ({ db, t, owner, engineer, studyId } = await openTeamStudy('Words team', 'Words study')));

afterAll(() => closeTeamStudy({ db, t }));

/** What a person must never read in an error message. */
const INTERNAL: RegExp[] = [
  /^[a-z][A-Za-z]*(\.[\w[\]]+)*: /, // starts with a field key or a path: "name: …", "content.circuit: …"
  /\b[a-z][A-Za-z]*\.[a-z][A-Za-z]*\.\w+/, // a dotted path anywhere
  /\.\d+\b/, // a list index in a path ("nodes.3")
  /Invalid input|Invalid option|Too small: expected|Too big: expected|received (undefined|string|number)/, // the validator's phrasing
  /\b(pageSize|acknowledgeViolations|updatedAt|version)\b/, // internal keys
  /[{}]/,
];

function readable(message: string) {
  for (const re of INTERNAL) expect(message, `"${message}" matches ${re}`).not.toMatch(re);
}

async function refused(res: { status: number; body: { error: { code: string; message: string; fields?: Record<string, string> } } }) {
  expect(res.status, JSON.stringify(res.body)).toBe(400);
  expect(res.body.error.code).toBe('validation');
  readable(res.body.error.message);
  for (const v of Object.values(res.body.error.fields ?? {})) readable(v);
  return res.body.error;
}

describe('validation messages name what people see', () => {
  it('a study name: the label, not the key', async () => {
    const e = await refused(await engineer.post('/api/studies').set('Origin', APP_URL).send({ name: 42 }));
    expect(e.message).toBe('Study name must be text');
    expect(e.fields).toEqual({ name: 'Study name must be text' });
    // A message written for people stands alone.
    const empty = await refused(await engineer.post('/api/studies').set('Origin', APP_URL).send({ name: '' }));
    expect(empty.message).toBe('Name is required');
  });

  it('a missing version is a sentence that says what to do, not the key', async () => {
    const e = await refused(await engineer.patch(`/api/studies/${studyId}`).set('Origin', APP_URL).send({ name: 'Renamed' }));
    expect(e.message).toBe('The page did not say which saved state of the study it changes; reload the page and try again.');
    expect(Object.keys(e.fields ?? {})).toContain('version');
  });

  it('a bad entry of the diagram layout: "Diagram layout › shape 4", no JSON path', async () => {
    const e = await refused(await engineer.post('/api/studies').set('Origin', APP_URL).send({ name: 'L', content: { circuit, layout: { nodes: [{}, {}, {}, { label: 'x\u0000' }] } } }));
    expect(e.message).toMatch(/^Diagram layout › shape 4 › Label/);
    expect(Object.keys(e.fields ?? {})).toEqual(['content.layout.nodes.3.label']);
  });

  it('a circuit that is not one: says so in words, naming the circuit', async () => {
    const e = await refused(await engineer.post('/api/studies').set('Origin', APP_URL).send({ name: 'C', content: { circuit: 5 } }));
    expect(e.message).toMatch(/^The circuit /);
  });

  it('a choice out of a list names the choices when they are words', async () => {
    const team = await owner.get('/api/team');
    const member = (team.body.members as { userId: string; role: string }[]).find((m) => m.role === 'engineer')!;
    const e = await refused(await owner.patch(`/api/team/members/${member.userId}`).set('Origin', APP_URL).send({ role: 'king' }));
    expect(e.message).toBe('Role must be one of owner, engineer, reviewer, viewer');
  });

  it('query parameters: "Page must be at least 1", and internal sort keys are not listed', async () => {
    const page = await refused(await engineer.get('/api/studies?page=0'));
    expect(page.message).toBe('Page must be at least 1');
    const sort = await refused(await engineer.get('/api/studies?sort=zzz'));
    expect(sort.message).toBe('Sort order is not one of the choices offered');
  });
});
