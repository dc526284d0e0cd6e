import { describe, expect, it } from 'vitest';
import { missingOpeningItems } from './opening-requirements';

describe('missingOpeningItems', () => {
  it('names each refused item by its set-up section and keeps unknown keys as they are', () => {
    expect(
      missingOpeningItems([
        { field: 'assignmentScheme', message: 'choose an assignment scheme' },
        { field: 'consent', message: 'activate a consent version' },
        { field: 'budget', message: 'fund the study' },
      ]),
    ).toEqual([
      { key: 'assignmentScheme', label: 'Assignment scheme', detail: 'choose an assignment scheme' },
      { key: 'consent', label: 'Consent form', detail: 'activate a consent version' },
      { key: 'budget', label: 'budget', detail: 'fund the study' },
    ]);
  });
});
