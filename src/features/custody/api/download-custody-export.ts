import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

/**
 * The signed PDF of a legal-evidence case's custody log, handed to the browser as a download (a plain
 * link would carry no token). The signature and head hash are printed on the PDF itself.
 */
export async function downloadCustodyExport(caseId: string, reference: string): Promise<void> {
  const blob = await api.get<Blob>(`/referrals/${encodeURIComponent(caseId)}/custody.pdf`, { responseType: 'blob' });
  const objectUrl = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = objectUrl;
  a.download = `custody-log-${reference}.pdf`;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(objectUrl), 60_000);
}

export function useDownloadCustodyExport() {
  return useMutation({ mutationFn: ({ caseId, reference }: { caseId: string; reference: string }) => downloadCustodyExport(caseId, reference) });
}
