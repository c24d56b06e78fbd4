import { mkdir, readFile, rename, unlink, writeFile } from 'node:fs/promises';
import path from 'node:path';

/** Where uploaded and generated files live. Keys are relative paths of letters, digits, '-', '_', '.', '/'. */
export interface FileStorage {
  put(key: string, bytes: Buffer): Promise<void>;
  /** null when the key holds nothing. */
  get(key: string): Promise<Buffer | null>;
  remove(key: string): Promise<void>;
}

const KEY = /^[a-z0-9][a-z0-9_-]*(\/[a-z0-9][a-z0-9._-]*)*$/i;

export class StorageKeyError extends Error {}

function checkKey(key: string): string {
  if (!KEY.test(key) || key.includes('..') || key.length > 200) throw new StorageKeyError(`not a storage key: ${JSON.stringify(key)}`);
  return key;
}

/** The default: files under one folder on the local disk (written to a temp name, then renamed). */
export function createLocalDiskStorage(root: string): FileStorage {
  const full = (key: string) => path.join(root, checkKey(key));
  return {
    async put(key, bytes) {
      const file = full(key);
      await mkdir(path.dirname(file), { recursive: true });
      const tmp = `${file}.${process.pid}.${Date.now()}.tmp`;
      await writeFile(tmp, bytes);
      await rename(tmp, file);
    },
    async get(key) {
      try {
        return await readFile(full(key));
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
        throw err;
      }
    },
    async remove(key) {
      await unlink(full(key)).catch((err: NodeJS.ErrnoException) => {
        if (err.code !== 'ENOENT') throw err;
      });
    },
  };
}
