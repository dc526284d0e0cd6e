import { describe, expect, it } from 'vitest';
import { wayfindingConsentFields } from './consent-fields.fixture';
import { fillConsentTemplate } from './consent-template';
import { countWords, estimateReadingTime, SILENT_READING_WORDS_PER_MINUTE } from './reading-time';

describe('reading time', () => {
  it('uses the meta-analytic adult silent reading rate for non-fiction, 238 words per minute (Brysbaert 2019, from memory)', () => {
    expect(SILENT_READING_WORDS_PER_MINUTE).toBe(238);
  });

  it('counts words as Unicode word segmentation does, ignoring punctuation and Markdown syntax', () => {
    // UAX #29: apostrophes inside words and a point between digits join; "(" splits "46.116(b)" into "46.116" and "b".
    expect(countWords('Don’t stop — it’s 46.116(b), fine?')).toBe(6);
    expect(estimateReadingTime('## Key **information**\n\n- one, two\n- three\n').words).toBe(5);
  });

  it('rounds up to whole minutes: 238 words is one minute, 239 is two', () => {
    expect(estimateReadingTime(`${'word '.repeat(238)}\n`)).toEqual({ words: 238, minutes: 1, wordsPerMinute: 238 });
    expect(estimateReadingTime(`${'word '.repeat(239)}\n`).minutes).toBe(2);
    expect(estimateReadingTime(`${'word '.repeat(239)}\n`, 120).minutes).toBe(2);
  });

  it('counts what participants see, not the staff notice', () => {
    const body = fillConsentTemplate(wayfindingConsentFields);
    const shown = estimateReadingTime(body);
    expect(estimateReadingTime(body.replace(/<!--[\s\S]*?-->/g, '')).words).toBe(shown.words);
    expect(shown.minutes).toBe(Math.ceil(shown.words / 238));
  });

  it('refuses a rate that is not a positive number', () => {
    expect(() => estimateReadingTime('Text\n', 0)).toThrow('wordsPerMinute: must be a positive number, got 0');
  });
});
