import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';

/**
 * An online backup of the SQLite database (SQLite's backup API through better-sqlite3, safe while the
 * server runs and writes) plus a copy of the photo files, into `<dest>/sablework-<stamp>/`.
 * Photos are written once under their final name and never changed, so copying them after the
 * database means every photo the backed-up rows point at is there.
 */
export async function backupDataDir(dataDir: string, dest: string, now = new Date()) {
  const source = path.join(dataDir, 'sablework.sqlite');
  if (!fs.existsSync(source)) throw new Error(`No database at ${source}: nothing to back up.`);
  const stamp = now.toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z');
  const folder = path.join(dest, `sablework-${stamp}`);
  fs.mkdirSync(folder, { recursive: true });
  const db = new Database(source, { fileMustExist: true });
  try {
    db.pragma('busy_timeout = 5000');
    await db.backup(path.join(folder, 'sablework.sqlite'));
  } finally {
    db.close();
  }
  const photos = path.join(dataDir, 'photos');
  if (fs.existsSync(photos)) {
    fs.cpSync(photos, path.join(folder, 'photos'), { recursive: true, filter: (src) => !src.includes(`${path.sep}.incoming`) });
  }
  return folder;
}
