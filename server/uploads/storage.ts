import { createHash, randomBytes } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { mkdir, rename, stat, unlink, writeFile } from 'node:fs/promises';
import path from 'node:path';
import type { Readable } from 'node:stream';

/**
 * Where uploaded bytes live. Content-addressed: the key is the SHA-256 of the bytes, so the
 * same photo is stored once however often it is uploaded. The default is the local disk; a
 * shared object store implements the same three methods when there is more than one instance.
 */
export interface BlobStorage {
  put(bytes: Uint8Array): Promise<{ key: string }>;
  /** The bytes as a stream, or null when nothing is stored under the key. */
  get(key: string): Promise<Readable | null>;
  has(key: string): Promise<boolean>;
}

const KEY = /^[0-9a-f]{64}$/;

export function contentHash(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** Files under `root/<first two hex digits>/<sha256>`; the name is the content's hash. */
export function localDiskStorage(root: string): BlobStorage {
  const base = path.resolve(root);
  const fileFor = (key: string) => {
    // Keys are only ever hex digests, so no key can name a path outside the folder.
    if (!KEY.test(key)) throw new Error('not a storage key');
    return path.join(base, key.slice(0, 2), key);
  };
  const exists = async (file: string) => {
    try {
      return (await stat(file)).isFile();
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return false;
      throw err;
    }
  };

  return {
    async put(bytes) {
      const key = contentHash(bytes);
      const file = fileFor(key);
      if (await exists(file)) return { key };
      await mkdir(path.dirname(file), { recursive: true, mode: 0o750 });
      // Written under a temporary name and renamed, so that a reader never sees half a file.
      const temp = `${file}.${randomBytes(6).toString('hex')}.tmp`;
      try {
        await writeFile(temp, bytes, { flag: 'wx', mode: 0o640 });
        await rename(temp, file);
      } catch (err) {
        await unlink(temp).catch(() => {});
        throw err;
      }
      return { key };
    },
    async get(key) {
      if (!KEY.test(key)) return null;
      const file = fileFor(key);
      if (!(await exists(file))) return null;
      return createReadStream(file);
    },
    async has(key) {
      return KEY.test(key) && exists(fileFor(key));
    },
  };
}

/** The upload folder must not be served as static files. */
export function assertOutsideWebRoot(uploadDir: string, staticDir: string): void {
  const uploads = path.resolve(uploadDir);
  const web = path.resolve(staticDir);
  const rel = path.relative(web, uploads);
  if (rel === '' || (!rel.startsWith('..') && !path.isAbsolute(rel))) {
    throw new Error(`UPLOAD_DIR (${uploads}) is inside STATIC_DIR (${web}); uploads would be served without access checks`);
  }
}
