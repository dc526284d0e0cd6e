/** The one look for a field's error; announced as soon as it appears. */
export function FieldError({ id, children }: { id?: string; children: string }) {
  return (
    <p id={id} role="alert" className="flex items-start gap-2 text-fine font-semibold text-ember">
      <span aria-hidden="true">⚠</span>
      <span>{children}</span>
    </p>
  );
}
