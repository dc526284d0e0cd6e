import { Link } from 'react-router-dom';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { type MyPlace, useMyPlaces } from '../api/get-my-place';
import { useStudies, type StudySummary } from '../api/get-studies';
import { LoadFailed } from '@/components/ui/load-failed';

/** The participant's studies, with loading, error and a real empty state. */
export function YourStudies() {
  const studies = useStudies();

  if (studies.isPending) return <Spinner label="Loading your studies…" />;

  if (studies.isError) {
    return <LoadFailed title="We could not load your studies" read={studies} />;
  }

  if (studies.data.length === 0) return <NoStudiesYet />;
  return <StudyList studies={studies.data} />;
}

function StudyList({ studies }: { studies: StudySummary[] }) {
  const places = useMyPlaces(studies.map((study) => study.id));
  return (
    <ul className="flex flex-col gap-4" aria-label="Studies you have joined">
      {studies.map((study, index) => (
        <StudyItem
          key={study.id}
          study={study}
          place={places[index]?.data}
          placeFailed={places[index]?.isError ?? false}
        />
      ))}
    </ul>
  );
}

const studyStateInPlainWords: Record<StudySummary['status'], string> = {
  draft: 'Not started yet',
  recruiting: 'Running',
  paused: 'Paused for now',
  closed: 'Finished',
};

/** Where this person stands, first by what they did (stopped, finished), then by what comes next for them. */
export function yourPartInPlainWords(place: MyPlace): string {
  if (place.status === 'lost') return 'Ended by the research team';
  switch (place.next) {
    case 'withdrawn':
      return 'You stopped taking part';
    case 'done':
      return 'You completed it';
    case 'excluded':
      return 'Not a fit for you';
    case 'screening':
      return 'Questions to answer';
    case 'consent':
      return 'Consent form to sign';
    case 're-consent':
      return 'Updated form to sign';
    case 'steps':
      return 'Taking part';
  }
}

function StudyItem({
  study,
  place,
  placeFailed,
}: {
  study: StudySummary;
  place: MyPlace | null | undefined;
  placeFailed: boolean;
}) {
  return (
    <li>
      <Card className="relative flex flex-col items-start gap-3">
        <h2 className="text-heading font-bold wrap-anywhere">
          {/* The whole card is the link's target area; the heading alone names it for screen readers. */}
          <Link
            to={`/s/${encodeURIComponent(study.slug)}`}
            className="rounded-soft text-ink underline decoration-clay decoration-2 underline-offset-4 after:absolute after:inset-0 after:rounded-card"
          >
            {study.title}
          </Link>
        </h2>
        <dl className="flex flex-wrap gap-2 text-fine">
          {place === null ? null : (
            <div className="flex flex-wrap items-baseline gap-x-1 rounded-full bg-clay-tint px-3 py-1">
              <dt className="text-ink-soft">Your part:</dt>
              <dd className="font-semibold text-ink">
                {place ? yourPartInPlainWords(place) : placeFailed ? 'Open the study to see' : 'Checking…'}
              </dd>
            </div>
          )}
          <div className="flex flex-wrap items-baseline gap-x-1 rounded-full bg-sand px-3 py-1">
            <dt className="text-ink-soft">Study:</dt>
            <dd className="font-semibold text-ink">{studyStateInPlainWords[study.status]}</dd>
          </div>
        </dl>
        <p className="text-fine text-ink-soft">
          {place?.next === 'withdrawn' || place?.next === 'done'
            ? 'Open it to see what you earned and to download your signed form.'
            : 'Open it to see where you are and what comes next.'}
        </p>
      </Card>
    </li>
  );
}

function NoStudiesYet() {
  return (
    <Card className="flex flex-col items-start gap-4">
      <svg aria-hidden="true" viewBox="0 0 64 64" className="size-16">
        <rect x="10" y="8" width="44" height="52" rx="8" className="fill-clay-tint stroke-clay" strokeWidth="3" />
        <path d="M22 24h20M22 34h20M22 44h12" className="stroke-clay" strokeWidth="3" strokeLinecap="round" />
      </svg>
      <h2 className="text-heading font-bold">No studies yet</h2>
      <p>
        When you join a study through a study link, it will appear here — with its steps, what each one pays and how you
        are getting on.
      </p>
      <p className="text-fine text-ink-soft">
        Got a study link from a research team? Open it, and sign in with this same e-mail address.
      </p>
    </Card>
  );
}
