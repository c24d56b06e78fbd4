import { Link, useParams } from 'react-router-dom';
import { BooksFrame } from '@/features/finance/components/books-frame';
import { PledgeBooks } from '@/features/finance/components/pledge-books';

export function Component() {
  const { pledgeId = '' } = useParams();
  return (
    <BooksFrame
      title="Pledge"
      description={
        <Link className="text-amber-300 underline underline-offset-2" to="/console/books/pledges">
          ← All pledges
        </Link>
      }
    >
      <PledgeBooks pledgeId={pledgeId} />
    </BooksFrame>
  );
}
