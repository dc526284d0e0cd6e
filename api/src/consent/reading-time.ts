import { ConsentErrorCode, consentFail } from './consent-error';
import { consentTextBlocks } from './consent-markdown';

/**
 * Average silent reading rate of adults for English non-fiction: 238 words per minute (Brysbaert, M. (2019),
 * "How many words do we read per minute? A review and meta-analysis of reading rate", Journal of Memory and
 * Language 109, 104047 — from memory). Consent forms are read more slowly than that, so the estimate is a floor.
 */
export const SILENT_READING_WORDS_PER_MINUTE = 238;

const wordSegmenter = new Intl.Segmenter('en', { granularity: 'word' });

/** Words as Unicode word segmentation (UAX #29, through Intl.Segmenter) finds them: "don't" and "46.116" are one each. */
export function countWords(text: string): number {
  let words = 0;
  for (const segment of wordSegmenter.segment(text)) if (segment.isWordLike) words += 1;
  return words;
}

export interface ReadingTimeEstimate {
  words: number;
  minutes: number;
  wordsPerMinute: number;
}

/** Whole minutes, rounded up; at least one minute for any text. Counts what the participant sees (no staff comments). */
export function estimateReadingTime(
  markdownSource: string,
  wordsPerMinute = SILENT_READING_WORDS_PER_MINUTE,
): ReadingTimeEstimate {
  if (!Number.isFinite(wordsPerMinute) || wordsPerMinute <= 0) {
    consentFail(
      ConsentErrorCode.InvalidFields,
      'wordsPerMinute',
      `must be a positive number, got ${String(wordsPerMinute)}`,
    );
  }
  const text = consentTextBlocks(markdownSource)
    .map((block) => (block.kind === 'rule' ? '' : block.runs.map((run) => run.text).join('')))
    .join('\n');
  const words = countWords(text);
  return { words, minutes: words === 0 ? 0 : Math.ceil(words / wordsPerMinute), wordsPerMinute };
}
