import { BooksFrame } from '@/features/finance/components/books-frame';
import { PledgeFinder } from '@/features/finance/components/pledge-finder';

export function Component() {
  return (
    <BooksFrame title="Pledges and refunds" description="Open a pledge to see its payments, ledger rows and receipts, and to refund it.">
      <PledgeFinder />
    </BooksFrame>
  );
}
