import { useMutation } from '@tanstack/react-query';
import type { CertificateDto } from '@shared/schemas/disposition';
import { api } from '@/lib/api-client';

/** The certificate of sanitization as a download (a plain link would carry no token). */
export async function downloadCertificate(certificate: CertificateDto): Promise<void> {
  const path = certificate.url.startsWith('/api/') ? certificate.url.slice(4) : certificate.url;
  const blob = await api.get<Blob>(path, { responseType: 'blob' });
  const objectUrl = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = objectUrl;
  a.download = `certificate-of-sanitization-${certificate.number}.pdf`;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(objectUrl), 60_000);
}

export function useDownloadCertificate() {
  return useMutation({ mutationFn: downloadCertificate });
}
