import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { assertKey, type FileStorage, type StagedFile } from './storage';

const TEMP_DIR = '.incoming';
/** Temp files older than this at start-up are leftovers of a crash mid-upload. */
const STALE_TEMP_MS = 60 * 60_000;

const ignoreMissing = (err: NodeJS.ErrnoException) => {
  if (err.code !== 'ENOENT') throw err;
};

/**
 * Files under `root` (DATA_DIR/photos). Bytes are written and fsynced under a random name in
 * root/.incoming, then renamed to their key: rename within one file system is atomic, so a reader
 * sees the whole file or none.
 */
export function localDiskStorage(root: string): FileStorage & { root: string } {
  const tempDir = path.join(root, TEMP_DIR);
  fs.mkdirSync(tempDir, { recursive: true });
  sweepStaleTemp(tempDir);
  const full = (key: string) => {
    assertKey(key);
    return path.join(root, key);
  };

  return {
    root,
    async stage(key, data): Promise<StagedFile> {
      const final = full(key);
      const temp = path.join(tempDir, `${crypto.randomUUID()}.part`);
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
          await fs.promises.mkdir(path.dirname(final), { recursive: true });
          await fs.promises.rename(temp, final);
          committed = true;
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
  };
}

/**
 * Removes the file's own folder once it is empty (a photo's files share one folder). Only that one
 * level: removing shared parents could race with another upload creating its folder there.
 */
async function removeEmptyFolder(root: string, dir: string) {
  if (dir === root || !dir.startsWith(root + path.sep)) return;
  await fs.promises.rmdir(dir).catch(() => undefined); // not empty, or already gone
}

function sweepStaleTemp(tempDir: string) {
  // File times are wall-clock times, so this compares with the wall clock, not the app's clock.
  const cutoff = Date.now() - STALE_TEMP_MS;
  for (const name of fs.readdirSync(tempDir)) {
    const file = path.join(tempDir, name);
    try {
      if (fs.statSync(file).mtimeMs < cutoff) fs.unlinkSync(file);
    } catch {
      // another process removed it first
    }
  }
}
