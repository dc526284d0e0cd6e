import { z } from 'zod';

// The api's CreateConditionDto rules (api/src/studies/dto/study.dto.ts).
export const conditionInputSchema = z.object({
  internalName: z.string().trim().max(120, 'Keep the name under 120 characters.'),
  participantLabel: z
    .string()
    .trim()
    .min(1, 'Enter what participants see this condition called.')
    .max(120, 'Keep the label under 120 characters.'),
  participantInstructions: z.string().max(8000, 'Keep the instructions under 8,000 characters.'),
  allocationWeight: z
    .string()
    .trim()
    .refine(
      (text) => /^\d+$/.test(text) && Number(text) >= 1 && Number(text) <= 100,
      'Enter a whole number from 1 to 100.',
    ),
});

export type ConditionFormValues = z.infer<typeof conditionInputSchema>;

/** The internal name is required when adding; when editing a blinded study it may stay hidden (empty). */
export const newConditionInputSchema = conditionInputSchema.extend({
  internalName: z
    .string()
    .trim()
    .min(1, 'Enter the name the study team uses for this condition.')
    .max(120, 'Keep the name under 120 characters.'),
});
