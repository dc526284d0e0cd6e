import { z } from 'zod';

// One shape for both sides of the form: the person (by e-mail, as the api takes it) or the study, and a role.
export const addMemberInputSchema = z.object({
  email: z.string({ error: 'Choose a staff member.' }).min(1, 'Choose a staff member.'),
  role: z.enum(['coordinator', 'researcher', 'auditor'], { error: 'Choose a role in the study.' }),
});
export type AddMemberInput = z.infer<typeof addMemberInputSchema>;

export const addStudyInputSchema = z.object({
  studyId: z.string({ error: 'Choose a study.' }).min(1, 'Choose a study.'),
  role: z.enum(['coordinator', 'researcher', 'auditor'], { error: 'Choose a role in the study.' }),
});
export type AddStudyInput = z.infer<typeof addStudyInputSchema>;
