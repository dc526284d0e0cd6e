import { Fieldset, Legend } from '@headlessui/react';
import { Controller, type UseFormReturn } from 'react-hook-form';
import { CheckboxField } from '@/components/ui/checkbox-field';
import { TextAreaField } from '@/components/ui/text-area-field';
import { TextField } from '@/components/ui/text-field';
import type { ConsentValueField, ConsentValuesInput } from '../api/create-consent-draft';
import { templateFieldGroups, templateFieldLabels } from '../utils/template-field-labels';

export interface TemplateValueFieldsProps<Values extends ConsentValuesInput> {
  form: UseFormReturn<Values>;
  /** The fields the template uses, in the form's order (`fieldsForTemplate`). */
  fields: readonly ConsentValueField[];
}

/** The template's value inputs, grouped under legends; used by the new-draft and the fill-in-again forms. */
export function TemplateValueFields<Values extends ConsentValuesInput>({
  form,
  fields,
}: TemplateValueFieldsProps<Values>) {
  // Every such form holds all the template values, so its template part is driven as a form of its own.
  const valuesForm = form as unknown as UseFormReturn<ConsentValuesInput>;
  return templateFieldGroups.map((group) => {
    const inGroup = fields.filter((field) => templateFieldLabels[field].group === group.id);
    if (inGroup.length === 0) return null;
    return (
      <Fieldset key={group.id} className="flex flex-col gap-3">
        <Legend className="text-sm font-semibold text-ink">{group.legend}</Legend>
        <div className="grid gap-3 sm:grid-cols-2">
          {inGroup.map((field) => (
            <TemplateValueField key={field} field={field} form={valuesForm} />
          ))}
        </div>
      </Fieldset>
    );
  });
}

function TemplateValueField({ field, form }: { field: ConsentValueField; form: UseFormReturn<ConsentValuesInput> }) {
  const { label, hint, kind } = templateFieldLabels[field];
  const error = form.formState.errors[field]?.message;

  if (kind === 'yes-no') {
    return (
      <Controller
        control={form.control}
        name="futureUseDeidentified"
        render={({ field: checkbox }) => (
          <CheckboxField
            className="sm:col-span-2"
            label={label}
            hint={hint}
            checked={checkbox.value}
            onChange={checkbox.onChange}
            error={error}
          />
        )}
      />
    );
  }
  if (kind === 'long-text') {
    return (
      <TextAreaField
        className="sm:col-span-2"
        label={label}
        hint={hint}
        error={error}
        rows={3}
        {...form.register(field)}
      />
    );
  }
  return (
    <TextField
      label={label}
      hint={hint}
      error={error}
      type={kind === 'number' ? 'text' : kind}
      inputMode={kind === 'number' ? 'numeric' : undefined}
      autoComplete="off"
      {...form.register(field)}
    />
  );
}
