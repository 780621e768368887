import { evaluationInput, labCaseDto, type LabCaseDto } from '@shared/schemas/lab-work';
import type { z } from 'zod';
import { api } from '@/lib/api-client';
import { useLabCaseMutation } from './lab-case-mutation';

export { evaluationInput };
export type EvaluationValues = z.output<typeof evaluationInput>;

export function recordEvaluation({ id, values }: { id: string; values: EvaluationValues }): Promise<LabCaseDto> {
  return api.put(`/lab/cases/${encodeURIComponent(id)}/evaluation`, { body: values, schema: labCaseDto });
}

export function useRecordEvaluation() {
  return useLabCaseMutation(recordEvaluation);
}
