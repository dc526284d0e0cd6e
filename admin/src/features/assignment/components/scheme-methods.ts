import type { SchemeMethod } from '../utils/scheme-settings';

/** Each method's name and a one-paragraph explanation for staff, in our own words. */
export const schemeMethodText: Record<SchemeMethod, { label: string; explanation: string }> = {
  simple: {
    label: 'Simple randomization',
    explanation:
      'Each person is assigned by a weighted draw, independent of everyone before them. Nobody can predict the next assignment, but in a small study the groups can end up noticeably unequal in size or make-up.',
  },
  'permuted-blocks': {
    label: 'Permuted blocks',
    explanation:
      'Assignments are dealt from shuffled blocks that each hold every condition in its exact ratio, with each block’s size drawn from the sizes you allow. Group sizes never drift far apart, and mixing block sizes keeps the next assignment hard to guess.',
  },
  'stratified-blocks': {
    label: 'Stratified permuted blocks',
    explanation:
      'Permuted blocks run separately in each stratum — each combination of the stratification factors’ levels, such as pretest below 50 or at or above 50. Suited to people who arrive one at a time online: every condition gets a similar mix of each band.',
  },
  minimization: {
    label: 'Minimization',
    explanation:
      'Each new person goes, with a set probability, to the condition that leaves the groups least unequal across all factor levels together (Pocock & Simon, 1975), otherwise to another; ties are broken at random. It balances several factors at once where strata would become too small.',
  },
  'matched-pairs': {
    label: 'Matched pairs',
    explanation:
      'For a pretested cohort imported in one batch: people are sorted by the pretest, neighbours form pairs, and a fair coin decides who in each pair gets which of the two conditions. With an odd number, the last person stays unpaired and is reported.',
  },
  counterbalanced: {
    label: 'Counterbalanced AB / BA',
    explanation:
      'For two conditions: half the participants do A then B, the other half B then A. Orders are handed out in blocks so the two stay even, and practice or fatigue effects cancel out between the conditions.',
  },
  'latin-square': {
    label: 'Latin square',
    explanation:
      'A cyclic Latin square: across its orders, every condition appears once in every position. Orders are handed out in blocks of whole squares. It balances position, but not which condition comes straight before which.',
  },
  williams: {
    label: 'Williams design',
    explanation:
      'A Latin square arranged so that every condition directly follows every other condition equally often (Williams, 1949), which also balances first-order carryover. With an odd number of conditions the design uses twice as many orders.',
  },
};
