export function Spinner({ label }: { label: string }) {
  return (
    <div role="status" className="flex flex-col items-center gap-4 py-10 text-ink-soft">
      <span
        aria-hidden="true"
        className="size-10 animate-spin rounded-full border-4 border-sand-deep border-t-clay motion-reduce:animate-none"
      />
      <span className="text-body">{label}</span>
    </div>
  );
}
