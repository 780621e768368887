import type { EntityManager } from 'typeorm';

type Reads<T extends readonly unknown[]> = { readonly [K in keyof T]: () => Promise<T[K]> };

/**
 * Independent reads: side by side when `manager` takes a pool connection per statement, one after
 * another inside a transaction, whose one connection runs one statement at a time (pg warns about a
 * second statement sent while one runs, and pg 9 will refuse it).
 */
export async function readTogether<T extends readonly unknown[]>(manager: EntityManager, reads: readonly [...Reads<T>]): Promise<T> {
  if (!manager.queryRunner?.isTransactionActive) return (await Promise.all(reads.map((read) => read()))) as unknown as T;
  const results: unknown[] = [];
  for (const read of reads) results.push(await read());
  return results as unknown as T;
}
