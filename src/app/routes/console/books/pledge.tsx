import { useParams } from 'react-router-dom';
import { BooksFrame } from '@/features/finance/components/books-frame';
import { PledgeBooks } from '@/features/finance/components/pledge-books';

export function Component() {
  const { pledgeId = '' } = useParams();
  return (
    <BooksFrame title="Pledge" back={{ to: '/console/books/pledges', label: 'All pledges' }}>
      <PledgeBooks pledgeId={pledgeId} />
    </BooksFrame>
  );
}
