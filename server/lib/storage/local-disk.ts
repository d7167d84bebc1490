import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { assertKey, type FileStorage, type StagedFile } from './storage';

const TEMP_DIR = '.incoming';
/** A temp file older than this is a leftover whoever wrote it: a live upload holds one for seconds. */
const STALE_TEMP_MS = 60 * 60_000;

const ignoreMissing = (err: NodeJS.ErrnoException) => {
  if (err.code !== 'ENOENT') throw err;
};

/**
 * Files under `root` (DATA_DIR/photos). Bytes are written and fsynced under a random name in
 * root/.incoming, then renamed to their key: rename within one file system is atomic, so a reader
 * sees the whole file or none. The folder is fsynced after the rename, so the new name is on disk
 * before the transaction that records it commits.
 *
 * Temp names start with the writing process's id. On creation the store removes the temp files of
 * a process that is gone (killed mid-upload), its own id's (left by an earlier process that had the
 * same id, as after a container restart) and any older than an hour; a live process's recent ones stay.
 * Create one store per root in a process, before any upload.
 */
export function localDiskStorage(root: string): FileStorage & { root: string; list(): Promise<string[]>; sweptTempFiles: number } {
  const tempDir = path.join(root, TEMP_DIR);
  fs.mkdirSync(tempDir, { recursive: true });
  const sweptTempFiles = sweepStaleTemp(tempDir);
  const full = (key: string) => {
    assertKey(key);
    return path.join(root, key);
  };

  return {
    root,
    sweptTempFiles,
    async stage(key, data): Promise<StagedFile> {
      const final = full(key);
      const temp = path.join(tempDir, `${process.pid}-${crypto.randomUUID()}.part`);
      const fh = await fs.promises.open(temp, 'wx', 0o600);
      try {
        await fh.writeFile(data);
        await fh.sync();
      } catch (err) {
        await fh.close();
        await fs.promises.unlink(temp).catch(ignoreMissing);
        throw err;
      }
      await fh.close();
      let committed = false;
      return {
        key,
        async commit() {
          const folder = path.dirname(final);
          const created = await fs.promises.mkdir(folder, { recursive: true });
          await fs.promises.rename(temp, final);
          committed = true;
          // the new name, and the names of folders just made, in their folders
          await syncDir(folder);
          if (created) for (let d = folder; d !== path.dirname(created); d = path.dirname(d)) await syncDir(path.dirname(d));
        },
        async discard() {
          await fs.promises.unlink(committed ? final : temp).catch(ignoreMissing);
          if (committed) await removeEmptyFolder(root, path.dirname(final));
        },
      };
    },
    async read(key) {
      const file = full(key);
      try {
        const st = await fs.promises.stat(file);
        if (!st.isFile()) return null;
        return { stream: fs.createReadStream(file), size: st.size };
      } catch (err) {
        ignoreMissing(err as NodeJS.ErrnoException);
        return null;
      }
    },
    async delete(key) {
      const file = full(key);
      await fs.promises.unlink(file).catch(ignoreMissing);
      await removeEmptyFolder(root, path.dirname(file));
    },
    async list() {
      const names = (await fs.promises.readdir(root, { recursive: true, withFileTypes: true })) as fs.Dirent[];
      return names
        .filter((d) => d.isFile())
        .map((d) => path.relative(root, path.join(d.parentPath, d.name)).split(path.sep).join('/'))
        .filter((key) => !key.startsWith(`${TEMP_DIR}/`))
        .sort();
    },
  };
}

async function syncDir(dir: string) {
  const fh = await fs.promises.open(dir, 'r');
  try {
    await fh.sync();
  } finally {
    await fh.close();
  }
}

/**
 * Removes the file's own folder once it is empty (a photo's files share one folder). Only that one
 * level: removing shared parents could race with another upload creating its folder there.
 */
async function removeEmptyFolder(root: string, dir: string) {
  if (dir === root || !dir.startsWith(root + path.sep)) return;
  await fs.promises.rmdir(dir).catch(() => undefined); // not empty, or already gone
}

/** Is a process with this id running? (EPERM: it runs, as another user.) */
function alive(pid: number) {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** Removes the temp files no running upload can still want (see localDiskStorage); returns how many. */
function sweepStaleTemp(tempDir: string) {
  // File times are wall-clock times, so this compares with the wall clock, not the app's clock.
  const cutoff = Date.now() - STALE_TEMP_MS;
  let removed = 0;
  for (const name of fs.readdirSync(tempDir)) {
    const file = path.join(tempDir, name);
    const pid = Number(/^(\d+)-/.exec(name)?.[1] ?? NaN);
    try {
      const leftover = pid === process.pid || (Number.isSafeInteger(pid) && pid > 0 && !alive(pid)) || fs.statSync(file).mtimeMs < cutoff;
      if (leftover) {
        fs.unlinkSync(file);
        removed++;
      }
    } catch {
      // another process removed it first
    }
  }
  return removed;
}
