import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { watchKeys } from './watch-keys';

export type AttritionReport = components['schemas']['AttritionReportDto'];
export type ConditionAttrition = components['schemas']['ConditionAttritionDto'];
export type WwcPair = components['schemas']['WwcPairDto'];
export type DropoutTest = components['schemas']['DropoutTestDto'];
export type SurvivalCurve = components['schemas']['SurvivalCurveDto'];
export type SurvivalPoint = components['schemas']['SurvivalPointDto'];
export type LogRank = components['schemas']['LogRankDto'];
export type PayParity = components['schemas']['PayParityDto'];
export type PayBasis = components['schemas']['PayBasisDto'];
export type WelchAnova = components['schemas']['WelchAnovaDto'];
export type CovariateBalanceRow = components['schemas']['CovariateBalanceRowDto'];
export type ConsortFlow = components['schemas']['ConsortFlowDto'];
export type FlowBox = components['schemas']['FlowBoxDto'];
export type ContactsByCondition = components['schemas']['ContactsByConditionDto'];
export type Stratified = components['schemas']['StratifiedDto'];
export type CoxModel = components['schemas']['CoxModelDto'];
export type PlannedLength = components['schemas']['PlannedLengthDto'];
export type MeanDifference = components['schemas']['MeanDifferenceDto'];

export async function getAttritionReport(
  studyId: string,
  comparisonConditionId: string | null,
): Promise<AttritionReport> {
  return unwrap(
    apiClient.GET('/api/studies/{studyId}/attrition', {
      params: { path: { studyId }, query: comparisonConditionId ? { comparisonConditionId } : {} },
    }),
  );
}

export const attritionReportQueryOptions = (studyId: string, comparisonConditionId: string | null) =>
  queryOptions({
    queryKey: watchKeys.report(studyId, comparisonConditionId),
    queryFn: () => getAttritionReport(studyId, comparisonConditionId),
  });

/** Keeps the last report on screen while another comparison condition loads, so the page does not jump. */
export function useAttritionReport(studyId: string, comparisonConditionId: string | null) {
  return useQuery({
    ...attritionReportQueryOptions(studyId, comparisonConditionId),
    placeholderData: keepPreviousData,
  });
}
