import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

/** Any payee's statement, for the network admin; fetched with the bearer token and saved from an object URL. */
export async function downloadNetworkStatement({ statementId, fileName }: { statementId: string; fileName: string }): Promise<void> {
  const blob = await api.get<Blob>(`/network/statements/${encodeURIComponent(statementId)}/csv`, { responseType: 'blob' });
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = fileName;
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

export function useDownloadNetworkStatement() {
  return useMutation({ mutationFn: downloadNetworkStatement });
}
