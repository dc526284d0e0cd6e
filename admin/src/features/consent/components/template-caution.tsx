import { Notice } from '@/components/ui/states';

/** DESIGN.md "Cautions shown in the product": templates are starting points, the ethics board decides the wording. */
export function TemplateCaution({ className }: { className?: string }) {
  return (
    <Notice tone="caution" className={className}>
      <p className="font-semibold">Templates are a starting point, not legal advice.</p>
      <p className="mt-0.5">
        The ethics board that approves your study decides the wording. Adapt the text to your study and have the board
        approve it before you activate it.
      </p>
    </Notice>
  );
}
