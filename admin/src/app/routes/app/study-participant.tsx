import { useParams } from 'react-router-dom';
import { ParticipantRecord } from '@/features/roster/components/participant-record';
import { useStudySession } from '../../study-context';

export function Component() {
  const { studyId = '', enrollmentId = '' } = useParams();
  const { study } = useStudySession();

  return (
    <>
      <title>{`Participant record · ${study.title} · Evenhand`}</title>
      <ParticipantRecord studyId={studyId} enrollmentId={enrollmentId} blinded={study.blinded} backHref={`/studies/${studyId}/roster`} />
    </>
  );
}
