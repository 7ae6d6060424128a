/**
 * Demo data for a first start in demo mode: an invented utility (Brackenmoor Public Power District,
 * serving the invented town of Kestle Ford), one account per role and one study per demo circuit
 * of the engine. Runs only on an empty database (no users), so a restart adds nothing.
 */
import { randomUUID } from 'node:crypto';
import { count } from 'drizzle-orm';
import type { StudyStatus } from '../../shared/api/studies.ts';
import { demoCircuits } from '../../shared/engine/index.ts';
import { hashPassword } from '../auth/passwords.ts';
import { DEMO_ACCOUNTS } from './demo-accounts.ts';
import type { Db } from './index.ts';
import { appendRevision } from '../services/revisions.ts';
import { auditEvents, memberships, reviewEvents, studies, teams, users } from './schema.ts';

export const DEMO_TEAM_NAME = 'Brackenmoor PPD — Kestle Ford Distribution';

/** How each demo study looks in the list: status, author and age, so the list reads like a team's real work. */
const STUDY_LOOKS: { status: StudyStatus; author: string; editor: string; daysAgo: number; isTemplate: boolean }[] = [
  { status: 'in-review', author: 'engineer@wyeward.test', editor: 'engineer@wyeward.test', daysAgo: 2, isTemplate: false },
  { status: 'approved', author: 'owner@wyeward.test', editor: 'owner@wyeward.test', daysAgo: 19, isTemplate: true },
  { status: 'changes-requested', author: 'engineer@wyeward.test', editor: 'owner@wyeward.test', daysAgo: 6, isTemplate: false },
  { status: 'draft', author: 'engineer@wyeward.test', editor: 'engineer@wyeward.test', daysAgo: 0, isTemplate: false },
];

export interface SeedResult {
  created: boolean;
  users: number;
  studies: number;
}

/** Seeds the demo team if the database has no users yet. */
export async function seedDemo(db: Db): Promise<SeedResult> {
  const [{ n }] = await db.select({ n: count() }).from(users);
  if (n > 0) return { created: false, users: 0, studies: 0 };

  const hashes = await Promise.all(DEMO_ACCOUNTS.map((a) => hashPassword(a.password)));
  const now = Date.now();
  const day = 24 * 3600 * 1000;

  return db.transaction(async (tx) => {
    const [team] = await tx
      .insert(teams)
      .values({ name: DEMO_TEAM_NAME, createdAt: new Date(now - 30 * day) })
      .returning({ id: teams.id });
    const idByEmail = new Map<string, string>();
    for (const [i, a] of DEMO_ACCOUNTS.entries()) {
      const id = randomUUID();
      idByEmail.set(a.email, id);
      const joined = new Date(now - (30 - i) * day);
      await tx.insert(users).values({ id, email: a.email, name: a.name, passwordHash: hashes[i], createdAt: joined });
      await tx.insert(memberships).values({ userId: id, teamId: team.id, role: a.role, createdAt: joined });
    }

    const reviewerId = idByEmail.get('reviewer@wyeward.test')!;
    let made = 0;
    for (const [i, demo] of demoCircuits.entries()) {
      const look = STUDY_LOOKS[i % STUDY_LOOKS.length];
      const createdBy = idByEmail.get(look.author)!;
      const updatedBy = idByEmail.get(look.editor)!;
      const createdAt = new Date(now - (look.daysAgo + 3) * day);
      const updatedAt = new Date(now - look.daysAgo * day - (i + 1) * 3600 * 1000);
      const [study] = await tx
        .insert(studies)
        .values({
          teamId: team.id,
          name: demo.name,
          description: demo.description,
          content: { circuit: demo.circuit },
          status: look.status,
          isTemplate: look.isTemplate,
          version: createdBy === updatedBy ? 1 : 2,
          createdBy,
          updatedBy,
          createdAt,
          updatedAt,
          ...(look.status !== 'draft'
            ? { reviewRequestedBy: createdBy, reviewers: [reviewerId], reviewRevision: 1, approvedRevision: look.status === 'approved' ? 1 : null }
            : {}),
        })
        .returning({ id: studies.id });
      // Revision 1 with the engine's summary, and the review history that led to the study's status.
      await appendRevision(tx, { studyId: study.id, teamId: team.id, authorId: createdBy, content: { circuit: demo.circuit }, message: 'Initial revision', at: createdAt, audit: false });
      await tx.insert(auditEvents).values({ teamId: team.id, actorId: createdBy, action: 'revision.create', studyId: study.id, detail: { revision: 1, seeded: true }, at: createdAt });
      if (look.status !== 'draft') {
        const requestedAt = new Date(createdAt.getTime() + 3600 * 1000);
        await tx.insert(reviewEvents).values({ studyId: study.id, teamId: team.id, actorId: createdBy, action: 'request', fromStatus: 'draft', toStatus: 'in-review', revision: 1, reviewers: [reviewerId], message: 'Ready for a check.', at: requestedAt });
        await tx.insert(auditEvents).values({ teamId: team.id, actorId: createdBy, action: 'review.request', studyId: study.id, detail: { revision: 1, reviewers: [reviewerId], seeded: true }, at: requestedAt });
        if (look.status !== 'in-review') {
          const approved = look.status === 'approved';
          await tx.insert(reviewEvents).values({
            studyId: study.id,
            teamId: team.id,
            actorId: reviewerId,
            action: approved ? 'approve' : 'request-changes',
            fromStatus: 'in-review',
            toStatus: look.status,
            revision: 1,
            reviewers: [reviewerId],
            message: approved ? 'Checked against the field readings; fine to reuse.' : 'Please add the service earthing resistance measured on site.',
            at: new Date(requestedAt.getTime() + 3600 * 1000),
          });
          await tx.insert(auditEvents).values({
            teamId: team.id,
            actorId: reviewerId,
            action: approved ? 'review.approve' : 'review.request-changes',
            studyId: study.id,
            detail: { revision: 1, seeded: true },
            at: new Date(requestedAt.getTime() + 3600 * 1000),
          });
        }
      }
      await tx.insert(auditEvents).values({
        teamId: team.id,
        actorId: createdBy,
        action: 'study.create',
        studyId: study.id,
        detail: { name: demo.name, seeded: true },
        at: createdAt,
      });
      if (look.isTemplate) {
        await tx.insert(auditEvents).values({
          teamId: team.id,
          actorId: updatedBy,
          action: 'study.template',
          studyId: study.id,
          detail: { isTemplate: true, seeded: true },
          at: updatedAt,
        });
      }
      made++;
    }
    return { created: true, users: DEMO_ACCOUNTS.length, studies: made };
  });
}
