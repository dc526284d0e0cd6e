import { cx } from './cx';
import { panelRecipe } from './recipes';

export interface PanelProps {
  /** The id of the heading, for aria-labelledby and in-page links. */
  id: string;
  title: string;
  description?: React.ReactNode;
  actions?: React.ReactNode;
  children: React.ReactNode;
  className?: string;
}

/** A titled section of a page: heading, a line of explanation, actions on the right. */
export function Panel({ id, title, description, actions, children, className }: PanelProps) {
  return (
    <section aria-labelledby={`${id}-heading`} id={id} className={cx(panelRecipe.frame, 'scroll-mt-4', className)}>
      <div className={panelRecipe.header}>
        <div>
          <h2 id={`${id}-heading`} className={panelRecipe.title}>
            {title}
          </h2>
          {description && <div className={panelRecipe.description}>{description}</div>}
        </div>
        {actions && <div className="flex flex-wrap gap-2">{actions}</div>}
      </div>
      <div className={panelRecipe.body}>{children}</div>
    </section>
  );
}
