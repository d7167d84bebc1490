import type { Readable } from 'node:stream';

/**
 * Where photo files live. Writing is two-phase so a caller can tie files to a database transaction:
 * `stage` stores the bytes under a temporary name, `commit` gives them their final key (atomically on
 * local disk), `discard` drops them. No half-written file ever carries a final key.
 * The local-disk adapter is the default; an object store (S3 and the like) can implement the same.
 */
export interface FileStorage {
  stage(key: string, data: Buffer): Promise<StagedFile>;
  /** null when no file has that key. */
  read(key: string): Promise<{ stream: Readable; size: number } | null>;
  /** Removes the file; a missing file is not an error. */
  delete(key: string): Promise<void>;
  /**
   * Every committed file's key, for the start-up sweep of files no row refers to (left by a crash between
   * a file's commit and its transaction's). Optional: a store that cannot list is not swept.
   */
  list?(): Promise<string[]>;
}

export interface StagedFile {
  readonly key: string;
  commit(): Promise<void>;
  /** Removes the staged bytes, or the committed file when commit already ran. Never throws for a missing file. */
  discard(): Promise<void>;
}

/** Keys are relative paths of lower-case letters, digits, dot, dash and underscore; never `..` or absolute. */
export function assertKey(key: string) {
  if (!/^[a-z0-9][a-z0-9._-]*(\/[a-z0-9][a-z0-9._-]*)*$/.test(key) || key.split('/').some((p) => p === '..' || p === '.')) {
    throw new Error(`invalid storage key: ${key}`);
  }
}
