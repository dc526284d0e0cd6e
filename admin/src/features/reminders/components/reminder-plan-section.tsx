import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { Controller, useFieldArray, useForm } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/panel';
import { SelectField } from '@/components/ui/select-field';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { SwitchField } from '@/components/ui/switch-field';
import { TextField } from '@/components/ui/text-field';
import { ApiError } from '@/lib/api-error';
import { applyApiFieldErrors } from '@/lib/form-field-errors';
import { useReminderPlan, type ReminderPlan, type ReminderRule } from '../api/get-reminder-plan';
import {
  reminderPlanInputSchema,
  useSaveReminderPlan,
  type ReminderPlanFormValues,
  type SaveReminderPlanBody,
} from '../api/save-reminder-plan';

const anchorOptions = [
  { value: 'opens', label: 'days after the step opens' },
  { value: 'due', label: 'days before the step is due' },
] as const;

function ruleSentence(rule: ReminderRule): string {
  const days = `${rule.days} ${rule.days === 1 ? 'day' : 'days'}`;
  if (rule.anchor === 'opens') return rule.days === 0 ? 'The day the step opens' : `${days} after the step opens`;
  return rule.days === 0 ? 'On the due date' : `${days} before the step is due`;
}

export interface ReminderPlanSectionProps {
  studyId: string;
  canEdit: boolean;
}

export function ReminderPlanSection({ studyId, canEdit }: ReminderPlanSectionProps) {
  const plan = useReminderPlan(studyId);
  return (
    <Panel
      id="reminders"
      title="Reminders"
      description="E-mails that remind participants of a step that is open or nearly due, and when Evenhand suggests marking someone lost to follow-up."
    >
      <Notice tone="info" className="mb-4">
        <span className="font-semibold">One plan for every condition, by design.</span> Reminders that differ by
        condition can themselves make dropout differ between conditions, which would bias the comparison the study
        exists to make. The dropout watch compares contacts by condition to check this.
      </Notice>
      {plan.isPending ? (
        <LoadingState label="Loading the reminder plan…" />
      ) : plan.isError ? (
        <ErrorState
          message={plan.error instanceof ApiError ? plan.error.message : 'The reminder plan could not be loaded.'}
          onRetry={() => void plan.refetch()}
        />
      ) : canEdit ? (
        <ReminderPlanForm studyId={studyId} plan={plan.data} />
      ) : (
        <ReminderPlanSummary plan={plan.data} />
      )}
    </Panel>
  );
}

function ReminderPlanSummary({ plan }: { plan: ReminderPlan }) {
  return (
    <div className="flex flex-col gap-3 text-sm">
      <p>{plan.enabled ? 'Reminders are sent.' : 'Reminders are switched off.'}</p>
      {plan.rules.length === 0 ? (
        <p className="text-ink-muted">No reminders are planned.</p>
      ) : (
        <ul className="list-disc pl-5" aria-label="Planned reminders">
          {plan.rules.map((rule) => (
            <li key={`${rule.anchor}-${rule.days}`}>{ruleSentence(rule)}</li>
          ))}
        </ul>
      )}
      <p>Evenhand suggests marking someone lost to follow-up after {plan.suggestLostAfter} unanswered reminders.</p>
      <EmailPreview plan={plan} />
    </div>
  );
}

function EmailPreview({ plan }: { plan: ReminderPlan }) {
  return (
    <figure className="flex flex-col gap-1">
      <figcaption className="text-xs font-semibold text-ink">
        The reminder e-mail, as participants receive it (filled in for the first step)
      </figcaption>
      <div className="rounded-md border border-line bg-canvas" data-testid="reminder-preview">
        <p className="border-b border-line px-3 py-2 text-sm">
          <span className="text-ink-muted">Subject: </span>
          <span className="font-medium">{plan.previewSubject}</span>
        </p>
        <p className="px-3 py-2 text-sm whitespace-pre-wrap">{plan.previewText}</p>
      </div>
    </figure>
  );
}

function ReminderPlanForm({ studyId, plan }: { studyId: string; plan: ReminderPlan }) {
  const save = useSaveReminderPlan(studyId);
  const [saved, setSaved] = useState<ReminderPlan>(plan);
  const [announcement, setAnnouncement] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<ReminderPlanFormValues, unknown, SaveReminderPlanBody>({
    resolver: zodResolver(reminderPlanInputSchema),
    defaultValues: {
      enabled: plan.enabled,
      rules: plan.rules.map((rule) => ({ anchor: rule.anchor, days: String(rule.days) })),
      suggestLostAfter: String(plan.suggestLostAfter),
    },
  });
  const { fields, append, remove } = useFieldArray({ control, name: 'rules' });

  const onSubmit = handleSubmit((body) => {
    setAnnouncement(null);
    save.mutate(body, {
      onSuccess: (next) => {
        setSaved(next);
        setAnnouncement('The reminder plan was saved. It applies to every participant in every condition.');
      },
      onError: (error) =>
        applyApiFieldErrors(error, setError, (field) => {
          const rule = /^rules\.(\d+)\.(anchor|days)$/.exec(field);
          if (rule) return `rules.${Number(rule[1])}.${rule[2] as 'days'}`;
          return field === 'suggestLostAfter' || field === 'enabled' ? field : field === 'rules' ? 'rules' : null;
        }),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Reminder plan">
      {errors.root?.server?.message && <Notice>{errors.root.server.message}</Notice>}
      <Controller
        control={control}
        name="enabled"
        render={({ field }) => (
          <SwitchField
            label="Send reminders"
            hint="Switched off, nobody gets reminder e-mails; staff can still send a message from a participant’s record."
            checked={field.value}
            onChange={field.onChange}
          />
        )}
      />

      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1 text-xs font-semibold text-ink">
          For each step, remind participants who have not done it
        </legend>
        {fields.length === 0 && <p className="text-sm text-ink-muted">No reminders planned. Add one below.</p>}
        <ol className="flex flex-col gap-2" aria-label="Planned reminders">
          {fields.map((field, index) => (
            <li
              key={field.id}
              className="flex flex-wrap items-start gap-2 rounded-md border border-line bg-canvas px-3 py-2"
            >
              <TextField
                label={`Reminder ${index + 1}: days`}
                inputMode="numeric"
                className="w-36"
                error={errors.rules?.[index]?.days?.message}
                {...register(`rules.${index}.days`)}
              />
              <Controller
                control={control}
                name={`rules.${index}.anchor`}
                render={({ field: anchor }) => (
                  <SelectField
                    label={`Reminder ${index + 1}: counted`}
                    value={anchor.value}
                    onChange={anchor.onChange}
                    onBlur={anchor.onBlur}
                    buttonRef={anchor.ref}
                    options={anchorOptions}
                    className="min-w-56 flex-1"
                  />
                )}
              />
              <Button
                variant="quiet"
                size="compact"
                className="mt-5"
                onClick={() => remove(index)}
                aria-label={`Remove reminder ${index + 1}`}
              >
                Remove
              </Button>
            </li>
          ))}
        </ol>
        {errors.rules?.root?.message && <p className="text-xs font-medium text-danger">{errors.rules.root.message}</p>}
        {errors.rules?.message && <p className="text-xs font-medium text-danger">{errors.rules.message}</p>}
        {fields.length < 10 && (
          <Button className="self-start" onClick={() => append({ anchor: 'opens', days: '' }, { shouldFocus: true })}>
            Add a reminder
          </Button>
        )}
      </fieldset>

      <TextField
        label="Suggest “lost to follow-up” after this many unanswered reminders"
        inputMode="numeric"
        hint="Reminders since the participant last finished a step. Evenhand only suggests; staff decide on the participant’s record."
        className="max-w-md"
        error={errors.suggestLostAfter?.message}
        {...register('suggestLostAfter')}
      />

      <EmailPreview plan={saved} />

      <div aria-live="polite" className="empty:hidden">
        {announcement && <Notice tone="info">{announcement}</Notice>}
      </div>
      <div>
        <Button type="submit" variant="primary" pending={save.isPending}>
          Save the reminder plan
        </Button>
      </div>
    </form>
  );
}
