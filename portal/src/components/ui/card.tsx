import type { ReactNode } from 'react';

export function Card({ children, className = '' }: { children: ReactNode; className?: string }) {
  return (
    <div className={`rounded-card border border-sand-deep bg-paper-raised p-6 shadow-card sm:p-8 ${className}`}>
      {children}
    </div>
  );
}
