import { useCallback, useState } from 'react';
import { clampedPosition } from '../utils/reading-pages';

const storageKey = (studyId: string, versionId: string) => `evenhand:consent-reading:${studyId}:${versionId}`;

function readStored(key: string): unknown {
  try {
    const raw = globalThis.localStorage?.getItem(key);
    return raw === null || raw === undefined ? null : (JSON.parse(raw) as unknown);
  } catch {
    return null;
  }
}

/**
 * Where the reader is in one version of the form, remembered on this device so a reload or a later visit picks up
 * at the same screen. The server knows the stage (read, sign); only the page within it lives here.
 */
export function useReadingPosition(studyId: string, versionId: string, screens: number) {
  const key = storageKey(studyId, versionId);
  const [state, setState] = useState(() => ({ key, position: clampedPosition(readStored(key), screens) }));
  // A new version (or study) starts from its own remembered place, not the old version's.
  const current = state.key === key ? state : { key, position: clampedPosition(readStored(key), screens) };
  if (current !== state) setState(current);

  const setPosition = useCallback(
    (position: number) => {
      const next = clampedPosition(position, screens);
      setState({ key, position: next });
      try {
        globalThis.localStorage?.setItem(key, JSON.stringify(next));
      } catch {
        // Private browsing may refuse storage; reading still works, it just starts over after a reload.
      }
    },
    [key, screens],
  );

  return [clampedPosition(current.position, screens), setPosition] as const;
}
