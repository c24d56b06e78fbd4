import { BooksFrame } from '@/features/finance/components/books-frame';
import { ReconciliationPanel } from '@/features/finance/components/reconciliation-panel';

export function Component() {
  return (
    <BooksFrame
      title="Reconcile"
      description="Compare the ledger with the processor’s records for a range of days, then work through what differs."
    >
      <ReconciliationPanel />
    </BooksFrame>
  );
}
