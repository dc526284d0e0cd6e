import { paragraphsOf } from '@/lib/text';
import type { MyEnrollment } from '../api/get-my-enrollment';

/** The condition as the participant knows it: its participant-facing label and what to do. */
export function YourCondition({ assignment }: { assignment: NonNullable<MyEnrollment['assignment']> }) {
  return (
    <section
      aria-labelledby="your-condition-heading"
      className="flex flex-col gap-3 rounded-card border-2 border-moss bg-moss-tint/60 p-5"
    >
      <p className="text-fine font-semibold tracking-wide text-moss-ink uppercase">What you will do</p>
      <h2 id="your-condition-heading" className="text-heading font-bold">
        {assignment.label}
      </h2>
      {paragraphsOf(assignment.instructions).map((paragraph, index) => (
        <p key={index} className="whitespace-pre-line">
          {paragraph}
        </p>
      ))}
    </section>
  );
}
