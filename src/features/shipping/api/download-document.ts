import { api } from '@/lib/api-client';

/**
 * Fetches a PDF with the session's token and hands it to the browser as a download (a plain link would
 * carry no token).
 */
export async function downloadDocument(url: string, fileName: string): Promise<void> {
  const path = url.startsWith('/api/') ? url.slice(4) : url;
  const blob = await api.get<Blob>(path, { responseType: 'blob' });
  const objectUrl = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = objectUrl;
  a.download = fileName;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(objectUrl), 60_000);
}
