import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { Payee } from '../payee';

export interface StatementDownload {
  payee: Payee;
  statementId: string;
  format: 'csv' | 'pdf';
  fileName: string;
}

/** Statements need the bearer token, so they are fetched as a blob and saved through an object URL. */
export async function downloadStatement({ payee, statementId, format, fileName }: StatementDownload): Promise<void> {
  const blob = await api.get<Blob>(`/${payee}/statements/${encodeURIComponent(statementId)}/${format}`, { responseType: 'blob' });
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = fileName;
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

export function useDownloadStatement() {
  return useMutation({ mutationFn: downloadStatement });
}
