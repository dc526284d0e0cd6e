import type { BadgeTone } from '@/components/ui/badge';
import type { StudyDesign, StudyStatus } from '../api/get-study';

export const studyStatusLabels: Record<StudyStatus, { label: string; tone: BadgeTone }> = {
  draft: { label: 'Draft', tone: 'neutral' },
  recruiting: { label: 'Recruiting', tone: 'success' },
  paused: { label: 'Paused', tone: 'caution' },
  closed: { label: 'Closed', tone: 'spruce' },
};

export const studyDesignLabels: Record<StudyDesign, string> = {
  between: 'Between subjects',
  within: 'Within subjects',
};
