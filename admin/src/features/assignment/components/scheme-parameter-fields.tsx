import { Controller, useFormContext, useWatch } from 'react-hook-form';
import { SelectField } from '@/components/ui/select-field';
import { SwitchField } from '@/components/ui/switch-field';
import { TextField } from '@/components/ui/text-field';
import { totalWeight, type SchemeContext, type SchemeFormValues } from '../utils/scheme-settings';

const measureOptions = [
  { value: 'range', label: 'Range', description: 'Largest minus smallest count in each level (the usual choice)' },
  { value: 'variance', label: 'Variance', description: 'Spread of the counts in each level; weighs every condition' },
] as const;

export interface SchemeParameterFieldsProps {
  context: SchemeContext;
  disabled?: boolean;
}

/**
 * The settings of the chosen method. Used inside a FormProvider whose values include SchemeFormValues at the top
 * level (the scheme form and the dry-run form).
 */
export function SchemeParameterFields({ context, disabled = false }: SchemeParameterFieldsProps) {
  const {
    register,
    control,
    formState: { errors },
  } = useFormContext<SchemeFormValues>();
  const method = useWatch<SchemeFormValues, 'method'>({ name: 'method' });
  const total = totalWeight(context.conditionWeights);
  const numericFactors = context.factors.filter((factor) => factor.kind === 'numeric');

  switch (method) {
    case 'permuted-blocks':
    case 'stratified-blocks':
      return (
        <TextField
          label="Allowed block sizes"
          autoComplete="off"
          disabled={disabled}
          hint={
            total > 0
              ? `Whole numbers, each a multiple of the total weight ${total}, e.g. ${total}, ${total * 2}. Each block’s size is drawn from this list.`
              : 'Whole numbers, each a multiple of the total weight of the conditions.'
          }
          error={errors.blockSizes?.message}
          className="max-w-md"
          {...register('blockSizes')}
        />
      );
    case 'minimization':
      return (
        <div className="grid max-w-2xl gap-3 sm:grid-cols-2">
          <Controller
            control={control}
            name="measure"
            render={({ field }) => (
              <SelectField
                label="Imbalance measure"
                value={field.value}
                onChange={field.onChange}
                onBlur={field.onBlur}
                buttonRef={field.ref}
                options={measureOptions}
                disabled={disabled}
              />
            )}
          />
          <TextField
            label="Probability of the least-imbalanced condition"
            autoComplete="off"
            disabled={disabled}
            hint="Default 2/3, Efron’s biased coin (Efron, 1971), on which Pocock & Simon (1975) build minimization. 1 always picks it; 0.5 ignores imbalance."
            error={errors.coinProbability?.message}
            {...register('coinProbability')}
          />
          <p className="text-xs text-ink-muted sm:col-span-2">
            Each factor’s weight in minimization is set with the stratification factors.
          </p>
        </div>
      );
    case 'matched-pairs':
      return (
        <Controller
          control={control}
          name="pretestKey"
          render={({ field, fieldState }) => (
            <SelectField
              label="Pretest to pair people on"
              value={field.value === '' ? undefined : field.value}
              onChange={field.onChange}
              onBlur={field.onBlur}
              buttonRef={field.ref}
              options={numericFactors.map((factor) => ({ value: factor.key, label: factor.key }))}
              placeholder={numericFactors.length === 0 ? 'No numeric factor yet' : 'Choose the pretest'}
              error={fieldState.error?.message}
              disabled={disabled}
              className="max-w-md"
            />
          )}
        />
      );
    case 'counterbalanced':
    case 'latin-square':
    case 'williams':
      return (
        <div className="flex max-w-2xl flex-col gap-3">
          <TextField
            label="Block sizes, in whole copies of the design"
            autoComplete="off"
            disabled={disabled}
            hint="1 hands out each set of orders before starting the next; 1, 2 mixes blocks of one or two copies."
            error={errors.squaresPerBlock?.message}
            className="max-w-md"
            {...register('squaresPerBlock')}
          />
          <Controller
            control={control}
            name="stratify"
            render={({ field }) => (
              <SwitchField
                label="Hand out orders separately in each stratum"
                checked={field.value}
                onChange={field.onChange}
                disabled={disabled}
                hint="Uses the stratification factors, so every order reaches a similar mix of each level."
              />
            )}
          />
          {errors.stratify?.message && (
            <p className="text-xs font-medium text-danger" role="alert">
              {errors.stratify.message}
            </p>
          )}
        </div>
      );
    default:
      return null;
  }
}
