import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, useFieldArray, useForm, useWatch } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { SelectField } from '@/components/ui/select-field';
import { Notice } from '@/components/ui/states';
import { TextAreaField } from '@/components/ui/text-area-field';
import { TextField } from '@/components/ui/text-field';
import { applyApiFieldErrors } from '@/lib/form-field-errors';
import { parseLines, parseNumberList } from '@/lib/number-list';
import { emptyFactorRow, factorsFormSchema, type FactorsFormValues } from '../api/factor-schema';
import type { StratificationFactor } from '../api/get-stratification-factors';
import { useReplaceStratificationFactors, type StratificationFactorInput } from '../api/replace-stratification-factors';
import { numericLevels, stratumCount } from '../utils/factor-levels';
import { PretestNote } from './pretest-note';

const kindOptions = [
  {
    value: 'numeric',
    label: 'Numeric (a score)',
    description: 'Split into bands at cut points, e.g. a pretest from 0 to 100',
  },
  { value: 'categorical', label: 'Categorical', description: 'One of a few named groups, e.g. a site or a device' },
] as const;

const rowFields = ['key', 'label', 'kind', 'cutPoints', 'categories', 'minimizationWeight'];

export interface FactorsFormProps {
  studyId: string;
  factors: readonly StratificationFactor[];
  pretestNote: string;
  onSaved: () => void;
  onCancel: () => void;
}

function levelsPreview(row: FactorsFormValues['factors'][number] | undefined): string[] {
  if (!row) return [];
  if (row.kind === 'categorical') return parseLines(row.categories);
  const cuts = parseNumberList(row.cutPoints);
  return cuts.ok ? numericLevels(cuts.values) : [];
}

export function FactorsForm({ studyId, factors, pretestNote, onSaved, onCancel }: FactorsFormProps) {
  const replace = useReplaceStratificationFactors(studyId);
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<FactorsFormValues, unknown, StratificationFactorInput[]>({
    resolver: zodResolver(factorsFormSchema),
    defaultValues: {
      factors: factors.map((factor) => ({
        key: factor.key,
        label: factor.label,
        kind: factor.kind,
        cutPoints: (factor.cutPoints ?? []).join(', '),
        categories: (factor.categories ?? []).join('\n'),
        minimizationWeight: String(factor.minimizationWeight),
      })),
    },
  });
  const { fields, append, remove } = useFieldArray({ control, name: 'factors' });
  const rows = useWatch({ control, name: 'factors' }) ?? [];
  const hasNumeric = rows.some((row) => row?.kind === 'numeric');
  const strata = stratumCount(rows.map((row) => levelsPreview(row).length));

  const onSubmit = handleSubmit((input) => {
    replace.mutate(input, {
      onSuccess: () => onSaved(),
      onError: (error) =>
        applyApiFieldErrors(error, setError, (field) => {
          const match = /^factors\.(\d+)\.(\w+)/.exec(field);
          return match && rowFields.includes(match[2] ?? '')
            ? (`factors.${Number(match[1])}.${match[2]}` as `factors.${number}.key`)
            : null;
        }),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Stratification factors">
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      {errors.factors?.root?.message && <Notice>{errors.factors.root.message}</Notice>}
      {fields.length === 0 && (
        <p className="text-sm text-ink-muted">
          No factors: everyone is in one stratum. Add a factor to balance conditions within its levels.
        </p>
      )}
      {fields.map((field, index) => {
        const row = rows[index];
        const rowErrors = errors.factors?.[index];
        const levels = levelsPreview(row);
        return (
          <fieldset key={field.id} className="rounded-md border border-line bg-canvas p-3">
            <legend className="px-1 text-sm font-semibold">Factor {index + 1}</legend>
            <div className="grid gap-3 sm:grid-cols-2">
              <TextField
                label="Question participants answer"
                autoComplete="off"
                error={rowErrors?.label?.message}
                className="sm:col-span-2"
                {...register(`factors.${index}.label`)}
              />
              <TextField
                label="Key"
                autoComplete="off"
                hint="Short name used in data and strata, e.g. sense_of_direction."
                error={rowErrors?.key?.message}
                {...register(`factors.${index}.key`)}
              />
              <Controller
                control={control}
                name={`factors.${index}.kind`}
                render={({ field: kindField }) => (
                  <SelectField
                    label="Kind"
                    value={kindField.value}
                    onChange={kindField.onChange}
                    onBlur={kindField.onBlur}
                    buttonRef={kindField.ref}
                    options={kindOptions}
                  />
                )}
              />
              {row?.kind === 'categorical' ? (
                <TextAreaField
                  label="Categories"
                  hint="One per line."
                  error={rowErrors?.categories?.message}
                  {...register(`factors.${index}.categories`)}
                />
              ) : (
                <TextField
                  label="Cut points"
                  autoComplete="off"
                  hint="A score at a cut point counts in the band above it. 50 gives “<50” and “≥50”."
                  error={rowErrors?.cutPoints?.message}
                  {...register(`factors.${index}.cutPoints`)}
                />
              )}
              <TextField
                label="Weight in minimization"
                inputMode="decimal"
                hint="Used only by minimization; 1 unless one factor matters more."
                error={rowErrors?.minimizationWeight?.message}
                {...register(`factors.${index}.minimizationWeight`)}
              />
            </div>
            <div className="mt-3 flex flex-wrap items-center justify-between gap-2">
              <p className="text-xs text-ink-muted" aria-live="polite">
                {levels.length > 0 ? (
                  <>
                    Levels: <span className="font-medium text-ink">{levels.join(' / ')}</span>
                  </>
                ) : (
                  'Levels appear here as you type.'
                )}
              </p>
              <Button
                variant="quiet"
                size="compact"
                onClick={() => remove(index)}
                aria-label={`Remove factor ${index + 1}`}
              >
                Remove
              </Button>
            </div>
          </fieldset>
        );
      })}
      {hasNumeric && <PretestNote note={pretestNote} />}
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div className="flex items-center gap-3">
          <Button onClick={() => append({ ...emptyFactorRow })} disabled={fields.length >= 8}>
            Add factor
          </Button>
          {fields.length > 0 && (
            <span className="text-xs text-ink-muted">
              {strata} {strata === 1 ? 'stratum' : 'strata'} in all
              {strata > 12 ? ' — many small strata balance poorly with stratified blocks; consider minimization.' : '.'}
            </span>
          )}
        </div>
        <div className="flex gap-2">
          <Button onClick={onCancel}>Cancel</Button>
          <Button type="submit" variant="primary" pending={replace.isPending}>
            Save factors
          </Button>
        </div>
      </div>
    </form>
  );
}
