import { Link, useParams } from 'react-router-dom';
import { BooksFrame } from '@/features/finance/components/books-frame';
import { MonthReportView } from '@/features/finance/components/month-report';

export function Component() {
  const { month = '' } = useParams();
  return (
    <BooksFrame
      title={`Close report ${month}`}
      description={
        <Link className="text-amber-300 underline underline-offset-2" to="/console/books/months">
          ← All months
        </Link>
      }
    >
      <MonthReportView month={month} />
    </BooksFrame>
  );
}
