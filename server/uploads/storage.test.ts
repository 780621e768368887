import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { text } from 'node:stream/consumers';
import { afterAll, describe, expect, it } from 'vitest';
import { assertOutsideWebRoot, contentHash, localDiskStorage } from './storage';

const root = mkdtempSync(path.join(os.tmpdir(), 'platterpost-storage-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe('local disk storage', () => {
  it('names the file by the SHA-256 of its content (FIPS 180-4 test vector: "abc" → ba7816bf…)', async () => {
    const storage = localDiskStorage(root);
    const { key } = await storage.put(Buffer.from('abc'));
    expect(key).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(readFileSync(path.join(root, 'ba', key), 'utf8')).toBe('abc');
  });

  it('stores the same content once however often it is put', async () => {
    const storage = localDiskStorage(root);
    const bytes = Buffer.from('the same photo, twice');
    const a = await storage.put(bytes);
    const b = await storage.put(Buffer.from(bytes));
    expect(a.key).toBe(b.key);
    expect(readdirSync(path.join(root, a.key.slice(0, 2)))).toEqual([a.key]);
  });

  it('reads back what was stored, and null for a key it does not hold', async () => {
    const storage = localDiskStorage(root);
    const { key } = await storage.put(Buffer.from('condition photo bytes'));
    expect(await text((await storage.get(key))!)).toBe('condition photo bytes');
    expect(await storage.has(key)).toBe(true);
    expect(await storage.get(contentHash(Buffer.from('never stored')))).toBeNull();
  });

  it('refuses a key that is not a hex digest, so no key can reach outside the folder', async () => {
    const storage = localDiskStorage(root);
    expect(await storage.get('../../etc/passwd')).toBeNull();
    expect(await storage.has('ab/../../x')).toBe(false);
  });

  it('refuses an upload folder inside the web root', () => {
    expect(() => assertOutsideWebRoot('dist/uploads', 'dist')).toThrow(/inside STATIC_DIR/);
    expect(() => assertOutsideWebRoot('dist', 'dist')).toThrow(/inside STATIC_DIR/);
    expect(() => assertOutsideWebRoot('.data/uploads', 'dist')).not.toThrow();
    expect(() => assertOutsideWebRoot('dist-uploads', 'dist')).not.toThrow();
  });
});
