import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';

/**
 * An online backup with SQLite's backup API: consistent while the server keeps writing (WAL), unlike
 * copying the file. Restore = stop the server, replace the database file with the backup, start.
 */
export async function backupDatabase(
  sourceFile: string,
  targetFile: string,
): Promise<{ pages: number; bytes: number }> {
  fs.mkdirSync(path.dirname(targetFile), { recursive: true });
  const db = new Database(sourceFile, { readonly: true, fileMustExist: true });
  try {
    let pages = 0;
    await db.backup(targetFile, {
      progress: ({ totalPages }) => {
        pages = totalPages;
        return 200;
      },
    });
    const check = new Database(targetFile, { readonly: true });
    try {
      const result = check.pragma('integrity_check', { simple: true });
      if (result !== 'ok') throw new Error(`backup failed its integrity check: ${String(result)}`);
    } finally {
      check.close();
    }
    return { pages, bytes: fs.statSync(targetFile).size };
  } finally {
    db.close();
  }
}

/** Restores a backup over the database file (the server must be stopped). */
export function restoreDatabase(backupFile: string, targetFile: string) {
  const check = new Database(backupFile, { readonly: true, fileMustExist: true });
  try {
    const result = check.pragma('integrity_check', { simple: true });
    if (result !== 'ok') throw new Error(`the backup is damaged: ${String(result)}`);
  } finally {
    check.close();
  }
  for (const suffix of ['-wal', '-shm']) fs.rmSync(targetFile + suffix, { force: true });
  fs.copyFileSync(backupFile, targetFile);
}
