import { BooksFrame } from '@/features/finance/components/books-frame';
import { DisputesTable } from '@/features/finance/components/disputes-table';

export function Component() {
  return (
    <BooksFrame title="Disputes" description="Payments a backer’s bank has questioned, with the day by which we must answer.">
      <DisputesTable />
    </BooksFrame>
  );
}
