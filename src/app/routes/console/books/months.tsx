import { FEATURED_CAMPAIGN } from '@/features/campaign/api/get-campaign';
import { BooksFrame } from '@/features/finance/components/books-frame';
import { MonthClose } from '@/features/finance/components/month-close';

export function Component() {
  return (
    <BooksFrame
      title="Months"
      description="Close each month after a clean reconciliation, read its report and publish its account for backers."
    >
      <MonthClose campaignSlug={FEATURED_CAMPAIGN} />
    </BooksFrame>
  );
}
