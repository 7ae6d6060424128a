/**
 * The set-up several boundary tests share: a fresh test database and app, a team with an owner
 * and an engineer signed in, and one study of the split-phase demo circuit.
 */
import type TestAgent from 'supertest/lib/agent.js';
import { demoCircuits } from '../../shared/engine/index.ts';
import { closeDb, type Db } from '../../server/db/index.ts';
import { APP_URL, makeApp, makeTeam, makeUser, signedIn, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

export const teamStudyCircuit = demoCircuits.find((d) => d.key === 'split-phase-120-240')!.circuit;

export interface TeamStudy {
  db: Db;
  t: TestApp;
  owner: TestAgent;
  engineer: TestAgent;
  studyId: string;
}

export async function openTeamStudy(teamName: string, studyName: string): Promise<TeamStudy> {
  const db = await openTestDb();
  const t = makeApp(db);
  const team = await makeTeam(db, teamName);
  const owner = await signedIn(t.app, (await makeUser(db, team, 'owner')).email);
  const engineer = await signedIn(t.app, (await makeUser(db, team, 'engineer')).email);
  const studyId = (await engineer.post('/api/studies').set('Origin', APP_URL).send({ name: studyName, content: { circuit: teamStudyCircuit } })).body.id;
  return { db, t, owner, engineer, studyId };
}

export async function closeTeamStudy({ db, t }: Pick<TeamStudy, 'db' | 't'>): Promise<void> {
  await t.mailer.close();
  await closeDb(db);
}
