/** "about 28 min", "about 3 h 5 min", "about 12 days 7 h": how long imaging should still take. */
export function formatRemaining(seconds: number): string {
  if (seconds <= 0) return 'done';
  const minutes = Math.max(1, Math.round(seconds / 60));
  if (minutes < 60) return `about ${minutes} min`;
  const hours = Math.floor(minutes / 60);
  const rest = minutes % 60;
  if (hours < 48) return `about ${hours} h${rest ? ` ${rest} min` : ''}`;
  const days = Math.floor(hours / 24);
  const h = hours % 24;
  return `about ${days} days${h ? ` ${h} h` : ''}`;
}

/** "120 MB/s" (SI, as imagers report it). */
export function formatRate(bytesPerSecond: number): string {
  if (bytesPerSecond >= 1e9) return `${(bytesPerSecond / 1e9).toFixed(1)} GB/s`;
  if (bytesPerSecond >= 1e6) return `${Math.round(bytesPerSecond / 1e6)} MB/s`;
  if (bytesPerSecond >= 1e3) return `${Math.round(bytesPerSecond / 1e3)} kB/s`;
  return `${Math.round(bytesPerSecond)} B/s`;
}
