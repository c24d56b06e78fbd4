import { useParams } from 'react-router-dom';
import { BooksFrame } from '@/features/finance/components/books-frame';
import { MonthReportView } from '@/features/finance/components/month-report';

export function Component() {
  const { month = '' } = useParams();
  return (
    <BooksFrame title={`Close report ${month}`} back={{ to: '/console/books/months', label: 'All months' }}>
      <MonthReportView month={month} />
    </BooksFrame>
  );
}
