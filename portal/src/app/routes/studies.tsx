import { useOutletContext } from 'react-router-dom';
import type { Me } from '@/features/auth/api/get-me';
import { YourStudies } from '@/features/studies/components/your-studies';

export function StudiesRoute() {
  const me = useOutletContext<Me>();
  return (
    <div className="flex flex-col gap-6">
      <title>Your studies · Evenhand</title>
      <div className="flex flex-col gap-2">
        <h1 className="text-title font-bold">Your studies</h1>
        <p className="text-body text-ink-soft">
          Signed in as <strong className="font-semibold wrap-anywhere text-ink">{me.email}</strong>
        </p>
      </div>
      <YourStudies />
    </div>
  );
}
