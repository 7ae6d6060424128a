/** Kept mail of earlier versions (files under DATA_DIR/mail) moves into the database at start. */
import { existsSync, mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, type Db } from '../../../server/db/index.ts';
import { createJobRunner } from '../../../server/jobs/index.ts';
import { createMailer } from '../../../server/mail/index.ts';
import { moveLocalMail, rawMail } from '../../../server/mail/store.ts';
import { openTestDb } from '../test-db.ts';

let db: Db;

beforeAll(async () => {
  db = await openTestDb();
});

afterAll(async () => {
  await closeDb(db);
});

describe('moving the mail folder of earlier versions', () => {
  it('brings every kept message into the database for the mail page, removes the files, and moves nothing twice', async () => {
    const dir = path.join(mkdtempSync(path.join(tmpdir(), 'wyeward-oldmail-')), 'mail');
    mkdirSync(dir);
    const old = [
      { id: '1764650000000-0a1b2c3d', teamId: 'team-old', to: 'ines@example.test', from: 'Wyeward <no-reply@wyeward.test>', subject: 'Invite', sentAt: '2025-12-02T04:33:20.000Z', text: 'join here', html: '<p>join here</p>' },
      { id: '1764650001000-0a1b2c3e', teamId: 'team-old', to: 'rhea@example.test', from: 'Wyeward <no-reply@wyeward.test>', subject: 'Review requested', sentAt: '2025-12-02T04:33:21.000Z', text: 'please review' },
    ];
    for (const m of old) {
      writeFileSync(path.join(dir, `${m.id}.json`), JSON.stringify(m));
      writeFileSync(path.join(dir, `${m.id}.eml`), `Subject: ${m.subject}\n\n${m.text}\n`);
    }
    expect(await moveLocalMail(db, dir)).toBe(2);
    expect(existsSync(dir)).toBe(false);
    const mailer = createMailer({ db, jobs: createJobRunner(db), from: 'x@example.test' });
    expect(await mailer.list('team-old')).toEqual([
      { id: old[1].id, to: 'rhea@example.test', subject: 'Review requested', sentAt: '2025-12-02T04:33:21.000Z', delivered: true },
      { id: old[0].id, to: 'ines@example.test', subject: 'Invite', sentAt: '2025-12-02T04:33:20.000Z', delivered: true },
    ]);
    expect(await mailer.get('team-old', old[0].id)).toEqual({ id: old[0].id, to: 'ines@example.test', from: 'Wyeward <no-reply@wyeward.test>', subject: 'Invite', sentAt: '2025-12-02T04:33:20.000Z', delivered: true, text: 'join here', html: '<p>join here</p>' });
    expect((await rawMail(db, old[1].id))?.raw).toBe('Subject: Review requested\n\nplease review\n');
    expect(await moveLocalMail(db, dir)).toBe(0);
  });
});
