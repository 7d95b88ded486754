import type { ReactNode } from 'react';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { ReviewerNote, type ReturnInfo } from './reviewer-note';

/** One card of the claim form; a reviewer's note for this part sits at its top. */
export function FormSection({
  id,
  title,
  description,
  note,
  actions,
  children,
}: {
  id: string;
  title: string;
  description?: ReactNode;
  note?: ReturnInfo | null;
  actions?: ReactNode;
  children: ReactNode;
}) {
  return (
    <Card aria-labelledby={`${id}-title`} id={id} className="scroll-mt-24">
      <CardHeader id={`${id}-title`} title={title} description={description} actions={actions} />
      <CardBody className="space-y-4">
        {note && <ReviewerNote info={note} compact />}
        {children}
      </CardBody>
    </Card>
  );
}
