import { BooksDashboard } from '@/features/finance/components/books-dashboard';
import { BooksFrame } from '@/features/finance/components/books-frame';

export function Component() {
  return (
    <BooksFrame
      title="Books"
      description="Reconcile with the processor, refund, follow disputes, close months and publish the monthly account."
    >
      <BooksDashboard />
    </BooksFrame>
  );
}
