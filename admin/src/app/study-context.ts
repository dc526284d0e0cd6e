import { useOutletContext } from 'react-router-dom';
import type { Study } from '@/features/studies/api/get-study';
import type { StaffSession } from './session-context';

/** What the study layout hands its pages: the signed-in person (as the shell does) and the loaded study. */
export interface StudySession extends StaffSession {
  study: Study;
}

/** The study of the page, for routes under /studies/:studyId (the layout renders them only once it has loaded). */
export function useStudySession(): StudySession {
  return useOutletContext<StudySession>();
}
