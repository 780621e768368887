import { useEffect, useState } from 'react';

/**
 * The value as it was once it stopped changing for `delayMs`. Compared by JSON, so a new
 * object with the same contents does not restart the wait.
 */
export function useDebouncedValue<T>(value: T, delayMs: number): T {
  const serialised = JSON.stringify(value) ?? 'undefined';
  const [settled, setSettled] = useState<{ key: string; value: T }>({ key: serialised, value });
  useEffect(() => {
    if (serialised === settled.key) return;
    const timer = window.setTimeout(() => setSettled({ key: serialised, value }), delayMs);
    return () => window.clearTimeout(timer);
    // `serialised` stands for `value`.
  }, [serialised, delayMs]);
  return settled.value;
}
