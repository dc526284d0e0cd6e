import { Notice } from '@/components/ui/notice';
import type { PublicStudy } from '../api/get-public-study';

/** Said calmly instead of a "Take part" button when a study is not taking new people. */
export function StudyClosedNotice({ status }: { status: Exclude<PublicStudy['status'], 'recruiting'> }) {
  return status === 'paused' ? (
    <Notice title="This study is not taking new people just now">
      The research team has paused it for a while. Please come back to this page later.
    </Notice>
  ) : (
    <Notice title="This study has finished">It is no longer taking new people. Thank you for your interest.</Notice>
  );
}
