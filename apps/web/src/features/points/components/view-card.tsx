import type { ReactNode } from 'react';
import { Card } from '../../../components/ui/card.tsx';

/** A point's analysis view: a card with its controls in a row at the head, the view under them. */
export function ViewCard({ head, children }: { head: ReactNode; children: ReactNode }) {
  return (
    <Card className="flex flex-col gap-4 p-4">
      <div className="flex flex-wrap items-end gap-4">{head}</div>
      {children}
    </Card>
  );
}
