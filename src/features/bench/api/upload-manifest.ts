import { labCaseDto, MANIFEST_MAX_BYTES, type LabCaseDto } from '@shared/schemas/lab-work';
import { api } from '@/lib/api-client';
import { useLabCaseMutation } from './lab-case-mutation';

export { MANIFEST_MAX_BYTES };

export function uploadManifest({ id, file }: { id: string; file: File }): Promise<LabCaseDto> {
  const body = new FormData();
  body.append('manifest', file);
  return api.post(`/lab/cases/${encodeURIComponent(id)}/manifest`, { body, schema: labCaseDto });
}

export function useUploadManifest() {
  return useLabCaseMutation(uploadManifest);
}
