/**
 * What may change in a study's details, and when. Before anyone is assigned every detail may change (the design only
 * while the study is a draft). From the first assignment on:
 * - the protocol reference is fixed: consent forms that people signed quote it;
 * - the currency and the blinding are fixed: pay is owed in that currency, and blinding ends only by closing or by
 *   unblinding with a recorded reason;
 * - the budget may rise but not fall: people took part on the pay it covers;
 * - the target size may not go below the number of people already assigned.
 * Title, description, contact, ethics approval reference, estimated time and lab name may always be corrected.
 * A closed study is sealed and an archived one is kept as it is: neither changes.
 */
export interface StudyDetails {
  status: 'draft' | 'recruiting' | 'paused' | 'closed';
  archived: boolean;
  design: string;
  protocolNumber: string | null;
  currency: string;
  blinded: boolean;
  budgetMinor: number;
  targetSize: number | null;
}

export interface RefusedDetail {
  field: string;
  message: string;
}

/** The rules above in words, for the api's answer and the edit screen. */
export const STUDY_EDIT_RULES: readonly string[] = [
  'Before anyone is assigned, every detail may change; the design only while the study is a draft.',
  'After the first assignment the protocol reference, currency and blinding are fixed: signed consent forms quote the protocol reference, pay is owed in that currency, and blinding ends only by closing or unblinding.',
  'After the first assignment the budget may be raised but not lowered, and the target size may not go below the number of people already assigned.',
  'The title, description, contact e-mail, ethics approval reference, estimated time and lab name may always be corrected.',
  'A closed study cannot be edited; an archived one is kept exactly as it was.',
];

/** The changes this study refuses now, each with its field and a reason in plain words; empty when all may be saved. */
export function refusedDetailChanges(
  current: StudyDetails,
  changes: Partial<StudyDetails>,
  assignedCount: number,
): RefusedDetail[] {
  const refused: RefusedDetail[] = [];
  const changing = <K extends keyof StudyDetails>(key: K) =>
    changes[key] !== undefined && changes[key] !== current[key];
  if (changing('design') && current.status !== 'draft') {
    refused.push({ field: 'design', message: 'The design is fixed once the study has opened.' });
  }
  if (assignedCount === 0) return refused;
  if (changing('protocolNumber')) {
    refused.push({
      field: 'protocolNumber',
      message: 'The protocol reference is fixed after the first assignment: signed consent forms quote it.',
    });
  }
  if (changing('currency'))
    refused.push({
      field: 'currency',
      message: 'The currency is fixed after the first assignment: pay is owed in it.',
    });
  if (changing('blinded')) {
    refused.push({
      field: 'blinded',
      message: 'Blinding is fixed after the first assignment; close the study or unblind it with a reason.',
    });
  }
  if (changes.budgetMinor !== undefined && changes.budgetMinor < current.budgetMinor) {
    refused.push({
      field: 'budgetMinor',
      message: 'The budget may be raised but not lowered after the first assignment.',
    });
  }
  if (changes.targetSize !== undefined && changes.targetSize !== null && changes.targetSize < assignedCount) {
    refused.push({
      field: 'targetSize',
      message: `The target size may not be below the ${assignedCount} ${assignedCount === 1 ? 'person' : 'people'} already assigned.`,
    });
  }
  return refused;
}
