import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { afterAll, describe, expect, it } from 'vitest';
import { backupDatabase, restoreDatabase } from '../../server/db/backup';
import { MIGRATIONS_FOLDER, openDatabase } from '../../server/db/client';
import { makeTestApp } from '../setup/test-app';

const dirs: string[] = [];
const tmp = () => {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), 'tetherwise-backup-'));
  dirs.push(d);
  return d;
};
afterAll(() => dirs.forEach((d) => fs.rmSync(d, { recursive: true, force: true })));

function dumpTables(file: string) {
  const db = new Database(file, { readonly: true });
  try {
    const tables = db
      .prepare("select name from sqlite_master where type='table' and name not like 'sqlite_%' order by name")
      .all() as { name: string }[];
    return Object.fromEntries(
      tables.map((t) => [t.name, db.prepare(`select * from "${t.name}" order by rowid`).all()]),
    );
  } finally {
    db.close();
  }
}

describe('migrations', () => {
  it('a second start on an existing database applies no migration again and keeps the data', () => {
    const file = path.join(tmp(), 'm.db');
    const first = openDatabase(file);
    first.sqlite
      .prepare("insert into users (email, name, role) values ('keep@example.org', 'Keep Me', 'viewer')")
      .run();
    const applied = first.sqlite.prepare('select count(*) n from __drizzle_migrations').get() as {
      n: number;
    };
    first.close();
    const expected = fs.readdirSync(MIGRATIONS_FOLDER).filter((f) => f.endsWith('.sql')).length;
    expect(applied.n).toBe(expected);

    const second = openDatabase(file);
    const again = second.sqlite.prepare('select count(*) n from __drizzle_migrations').get() as { n: number };
    const kept = second.sqlite.prepare("select name from users where email = 'keep@example.org'").get() as {
      name: string;
    };
    second.close();
    expect(again.n).toBe(expected);
    expect(kept.name).toBe('Keep Me');
  });

  it('WAL mode and foreign keys are on', () => {
    const handle = openDatabase(path.join(tmp(), 'p.db'));
    expect(handle.sqlite.pragma('journal_mode', { simple: true })).toBe('wal');
    expect(handle.sqlite.pragma('foreign_keys', { simple: true })).toBe(1);
    handle.close();
  });
});

describe('online backup and restore', () => {
  it('a backup taken while the server is running restores to the same data', async () => {
    const t = await makeTestApp();
    try {
      const admin = await t.agent('admin');
      await admin
        .post('/api/users/invite')
        .send({ email: 'backup.me@example.org', name: 'Backup Me', role: 'viewer' });
      const target = path.join(tmp(), 'backup.db');
      const { bytes } = await backupDatabase(t.ctx.config.databaseUrl, target);
      expect(bytes).toBeGreaterThan(0);

      // the live database moves on after the backup
      await admin
        .post('/api/users/invite')
        .send({ email: 'after.backup@example.org', name: 'After', role: 'viewer' });
      const atBackup = dumpTables(target);
      expect((atBackup.users as { email: string }[]).map((u) => u.email)).toContain('backup.me@example.org');
      expect((atBackup.users as { email: string }[]).map((u) => u.email)).not.toContain(
        'after.backup@example.org',
      );

      const restoredFile = path.join(tmp(), 'restored.db');
      fs.writeFileSync(restoredFile, 'an old damaged file');
      restoreDatabase(target, restoredFile);
      expect(dumpTables(restoredFile)).toEqual(atBackup);
      // the restored file opens as a normal database with nothing left to migrate
      const reopened = openDatabase(restoredFile);
      expect((reopened.sqlite.prepare('select count(*) n from users').get() as { n: number }).n).toBe(
        (atBackup.users as unknown[]).length,
      );
      reopened.close();
    } finally {
      await t.close();
    }
  });

  it('restore refuses a damaged backup', () => {
    const bad = path.join(tmp(), 'bad.db');
    fs.writeFileSync(bad, 'not a database at all');
    expect(() => restoreDatabase(bad, path.join(tmp(), 'x.db'))).toThrow();
  });
});
