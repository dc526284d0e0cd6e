import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { SelectField } from '@/components/ui/select-field';
import { Notice } from '@/components/ui/states';
import { SwitchField } from '@/components/ui/switch-field';
import { TextField } from '@/components/ui/text-field';
import { applyServerErrors } from '@/lib/form-server-errors';
import { minorToMajorText } from '@/lib/money';
import type { AttritionAlerts } from '../api/get-attrition-alerts';
import {
  alertThresholdsSchema,
  toAlertsInput,
  useSaveAttritionAlerts,
  type AlertThresholdsValues,
} from '../api/save-attrition-alerts';

export interface AlertThresholdsFormProps {
  studyId: string;
  alerts: AttritionAlerts;
  /** The comparison condition picked on the page, saved with the rules (the differential rule judges every pair). */
  comparisonConditionId: string | null;
  comparisonName?: string | null;
  /** Why p-value alerts are held to a stricter level until the planned size is reached. */
  repeatedLooks: string;
  canEdit: boolean;
}

export function AlertThresholdsForm({
  studyId,
  alerts,
  comparisonConditionId,
  canEdit,
  repeatedLooks,
}: AlertThresholdsFormProps) {
  const currency = alerts.payDifference.currency;
  const save = useSaveAttritionAlerts(studyId);
  const [saved, setSaved] = useState(false);
  const form = useForm<AlertThresholdsValues>({
    resolver: zodResolver(alertThresholdsSchema(currency)),
    defaultValues: {
      differentialEnabled: alerts.differentialAttrition.enabled,
      logRankEnabled: alerts.logRank.enabled,
      pValueBelow: String(alerts.logRank.pValueBelow),
      payEnabled: alerts.payDifference.enabled,
      payAmount: minorToMajorText(alerts.payDifference.amountMinor, currency),
      payBasis: alerts.payDifference.basis,
    },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setSaved(false);
    try {
      await save.mutateAsync(
        toAlertsInput(values, currency, comparisonConditionId ?? alerts.differentialAttrition.comparisonConditionId),
      );
      setSaved(true);
    } catch (error) {
      applyServerErrors(error, ['pValueBelow', 'payAmount', 'payBasis'], form.setError);
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Alert thresholds">
      <div aria-live="polite" className="empty:hidden">
        {errors.root?.server && <Notice>{errors.root.server.message}</Notice>}
        {saved && (
          <Notice tone="info">
            Alert thresholds saved. They are checked every {alerts.evaluatedEveryMinutes} minutes.
          </Notice>
        )}
      </div>
      <Controller
        control={form.control}
        name="differentialEnabled"
        render={({ field }) => (
          <SwitchField
            label="Differential attrition beyond the cautious WWC boundary"
            hint={`Any pair of conditions.${alerts.differentialAttrition.state.crossed ? ' Crossed at the last check.' : ''}`}
            checked={field.value}
            onChange={field.onChange}
            disabled={!canEdit}
          />
        )}
      />
      <div className="flex flex-wrap items-start gap-4">
        <Controller
          control={form.control}
          name="logRankEnabled"
          render={({ field }) => (
            <SwitchField
              className="min-w-64"
              label="Log-rank p-value below"
              hint={
                alerts.logRank.state.crossed ? 'Crossed at the last check.' : 'Time to dropout differs by condition.'
              }
              checked={field.value}
              onChange={field.onChange}
              disabled={!canEdit}
            />
          )}
        />
        <TextField
          className="w-32"
          label="p-value threshold"
          inputMode="decimal"
          disabled={!canEdit}
          error={errors.pValueBelow?.message}
          {...form.register('pValueBelow')}
        />
      </div>
      <p className="max-w-prose text-xs text-ink-muted" data-testid="repeated-looks">
        {repeatedLooks}
      </p>
      <div className="flex flex-wrap items-start gap-4">
        <Controller
          control={form.control}
          name="payEnabled"
          render={({ field }) => (
            <SwitchField
              className="min-w-64"
              label="Mean pay differs by more than"
              hint={alerts.payDifference.state.crossed ? 'Crossed at the last check.' : 'Per randomized participant.'}
              checked={field.value}
              onChange={field.onChange}
              disabled={!canEdit}
            />
          )}
        />
        <TextField
          className="w-32"
          label={`Amount (${currency})`}
          inputMode="decimal"
          disabled={!canEdit}
          error={errors.payAmount?.message}
          {...form.register('payAmount')}
        />
        <Controller
          control={form.control}
          name="payBasis"
          render={({ field }) => (
            <SelectField
              className="w-44"
              label="Pay counted"
              value={field.value}
              onChange={field.onChange}
              onBlur={field.onBlur}
              disabled={!canEdit}
              error={errors.payBasis?.message}
              options={[
                { value: 'earned', label: 'Earned' },
                { value: 'paid', label: 'Paid out' },
              ]}
            />
          )}
        />
      </div>
      {canEdit ? (
        <div>
          <Button type="submit" variant="primary" pending={save.isPending}>
            Save thresholds
          </Button>
        </div>
      ) : (
        <p className="text-xs text-ink-muted">Only the study's researchers and admins change alert thresholds.</p>
      )}
    </form>
  );
}
