import { zodResolver } from '@hookform/resolvers/zod';
import { Controller, FormProvider, useForm, useWatch } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/panel';
import { IndeterminateProgress } from '@/components/ui/progress-bar';
import { RadioCards } from '@/components/ui/radio-cards';
import { Notice } from '@/components/ui/states';
import { SwitchField } from '@/components/ui/switch-field';
import { TextField } from '@/components/ui/text-field';
import { applyApiFieldErrors } from '@/lib/form-field-errors';
import {
  defaultMix,
  dryRunFormSchema,
  mixFromStartingMix,
  startingMixSentence,
  maxDryRunArrivals,
  type DryRunFactor,
  type DryRunFormValues,
} from '../api/dry-run-schema';
import type { DryRunStartingMix } from '../api/get-starting-mix';
import { useRunDryRun, type DryRunRequest } from '../api/run-dry-run';
import { useElapsedSeconds } from '../hooks/use-elapsed-seconds';
import type { ArmCondition } from '../utils/arm-labels';
import { methodsFor, schemeFormValuesFrom, type SchemeContext } from '../utils/scheme-settings';
import { DryRunResults } from './dry-run-results';
import { SchemeParameterFields } from './scheme-parameter-fields';
import { schemeMethodText } from './scheme-methods';

export interface DryRunPanelProps {
  studyId: string;
  context: SchemeContext;
  conditions: readonly ArmCondition[];
  factors: readonly DryRunFactor[];
  savedMethod: string | null;
  savedSettings: Record<string, unknown>;
  /** The screened people's mix (or an even one), so the first run needs no typing; without it, an even mix. */
  startingMix?: DryRunStartingMix | null;
}

export function DryRunPanel({
  studyId,
  context,
  conditions,
  factors,
  savedMethod,
  savedSettings,
  startingMix = null,
}: DryRunPanelProps) {
  const dryRun = useRunDryRun(studyId);
  const elapsed = useElapsedSeconds(dryRun.isPending);
  const hasSaved = savedMethod !== null;
  const form = useForm<DryRunFormValues, unknown, DryRunRequest>({
    resolver: zodResolver(dryRunFormSchema(factors, context, hasSaved)),
    defaultValues: {
      arrivals: '1000',
      seed: '',
      compare: !hasSaved,
      mix: startingMix ? mixFromStartingMix(factors, startingMix) : defaultMix(factors),
      ...schemeFormValuesFrom(savedMethod, savedSettings, context),
    },
  });
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = form;
  const compare = useWatch({ control, name: 'compare' });
  const comparing = compare || !hasSaved;
  const requestedArrivals = dryRun.variables?.arrivals;
  const simulatedMethod = dryRun.variables?.method ?? savedMethod;

  const onSubmit = handleSubmit((request) => {
    dryRun.mutate(request, {
      onError: (error) =>
        applyApiFieldErrors(error, setError, (field) => {
          const first = field.split('.')[0];
          if (
            first === 'arrivals' ||
            first === 'seed' ||
            first === 'method' ||
            first === 'blockSizes' ||
            first === 'coinProbability' ||
            first === 'squaresPerBlock'
          )
            return first;
          const mix = /^covariateMix\.([^.]+)/.exec(field);
          const index = mix ? factors.findIndex((factor) => factor.key === mix[1]) : -1;
          if (index >= 0) return factors[index]?.kind === 'numeric' ? `mix.${index}.mean` : `mix.${index}.shares.0`;
          return null;
        }),
    });
  });

  const methodOptions = methodsFor(context.design).map((method) => ({
    value: method,
    label: schemeMethodText[method].label,
  }));

  return (
    <Panel
      id="dry-run"
      title="Dry run"
      description="Simulate arrivals with a throwaway seed to see how well the scheme keeps conditions balanced, overall and within each stratum, before anyone real is assigned."
    >
      <FormProvider {...form}>
        <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Dry run">
          {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
          <div className="grid gap-3 sm:grid-cols-2">
            <TextField
              label="Simulated arrivals"
              inputMode="numeric"
              hint={`Up to ${maxDryRunArrivals.toLocaleString()}. Large runs take a few seconds.`}
              error={errors.arrivals?.message}
              {...register('arrivals')}
            />
            <TextField
              label="Seed (optional)"
              autoComplete="off"
              hint="Leave empty for a fresh throwaway seed; paste one to repeat a run."
              error={errors.seed?.message}
              {...register('seed')}
            />
          </div>

          {factors.length > 0 && (
            <fieldset className="flex flex-col gap-3">
              <legend className="mb-1 text-sm font-semibold">Who arrives</legend>
              <p className="-mt-1 text-xs text-ink-muted">
                How the stratification answers are spread among simulated participants.
              </p>
              {startingMix && <p className="text-sm">{startingMixSentence(startingMix)}</p>}
              {factors.map((factor, index) =>
                factor.kind === 'numeric' ? (
                  <div
                    key={factor.key}
                    className="grid gap-3 rounded-md border border-line bg-canvas p-3 sm:grid-cols-[1fr_10rem_10rem]"
                  >
                    <p className="text-sm">
                      <span className="font-mono font-medium">{factor.key}</span>
                      <span className="block text-xs text-ink-muted">
                        Scores drawn from a normal distribution; cut at {(factor.cutPoints ?? []).join(', ')}.
                      </span>
                    </p>
                    <TextField
                      label="Average"
                      inputMode="decimal"
                      error={errors.mix?.[index]?.mean?.message}
                      {...register(`mix.${index}.mean`)}
                    />
                    <TextField
                      label="Standard deviation"
                      inputMode="decimal"
                      error={errors.mix?.[index]?.sd?.message}
                      {...register(`mix.${index}.sd`)}
                    />
                  </div>
                ) : (
                  <div key={factor.key} className="flex flex-col gap-2 rounded-md border border-line bg-canvas p-3">
                    <p className="text-sm">
                      <span className="font-mono font-medium">{factor.key}</span>
                      <span className="block text-xs text-ink-muted">
                        Relative shares: 2 and 1 means twice as many in the first.
                      </span>
                    </p>
                    <div className="grid gap-3 sm:grid-cols-4">
                      {(factor.categories ?? []).map((category, j) => (
                        <TextField
                          key={category}
                          label={`Share ${category}`}
                          inputMode="decimal"
                          error={errors.mix?.[index]?.shares?.[j]?.message}
                          {...register(`mix.${index}.shares.${j}`)}
                        />
                      ))}
                    </div>
                  </div>
                ),
              )}
            </fieldset>
          )}

          <fieldset className="flex flex-col gap-3">
            <legend className="mb-1 text-sm font-semibold">Scheme</legend>
            {hasSaved && (
              <Controller
                control={control}
                name="compare"
                render={({ field }) => (
                  <SwitchField
                    label="Try another scheme"
                    checked={field.value}
                    onChange={field.onChange}
                    hint={`Off: the saved scheme (${schemeMethodText[savedMethod as keyof typeof schemeMethodText]?.label ?? savedMethod}). On: compare with another method without saving it.`}
                  />
                )}
              />
            )}
            {comparing && (
              <>
                {!hasSaved && <p className="text-sm text-ink-muted">No scheme is saved yet; choose one to simulate.</p>}
                <Controller
                  control={control}
                  name="method"
                  render={({ field, fieldState }) => (
                    <RadioCards
                      label="Method to simulate"
                      value={field.value}
                      onChange={field.onChange}
                      options={methodOptions}
                      error={fieldState.error?.message}
                      columns={2}
                    />
                  )}
                />
                <SchemeParameterFields context={context} />
              </>
            )}
          </fieldset>

          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" variant="primary" pending={dryRun.isPending}>
              Run dry run
            </Button>
            {dryRun.isPending && (
              <div className="flex min-w-64 flex-1 flex-col gap-1" role="status">
                <IndeterminateProgress label="Dry run in progress" />
                <p className="text-xs text-ink-muted">
                  Simulating {requestedArrivals?.toLocaleString()} arrivals…{' '}
                  <span className="tabular-nums" aria-hidden="true">
                    {elapsed} s
                  </span>
                </p>
              </div>
            )}
          </div>
        </form>
      </FormProvider>

      <p aria-live="polite" className="sr-only">
        {dryRun.isSuccess && !dryRun.isPending
          ? `Dry run finished: ${dryRun.data.arrivals.toLocaleString()} arrivals simulated. Results follow.`
          : ''}
      </p>
      {dryRun.isSuccess && !dryRun.isPending && (
        <div className="mt-5 border-t border-line pt-5">
          <DryRunResults result={dryRun.data} conditions={conditions} method={simulatedMethod ?? null} />
        </div>
      )}
    </Panel>
  );
}
