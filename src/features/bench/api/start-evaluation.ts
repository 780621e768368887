import { labCaseDto, type LabCaseDto } from '@shared/schemas/lab-work';
import { api } from '@/lib/api-client';
import { useLabCaseMutation } from './lab-case-mutation';

export function startEvaluation(id: string): Promise<LabCaseDto> {
  return api.post(`/lab/cases/${encodeURIComponent(id)}/evaluation/start`, { schema: labCaseDto });
}

export function useStartEvaluation() {
  return useLabCaseMutation(startEvaluation);
}
