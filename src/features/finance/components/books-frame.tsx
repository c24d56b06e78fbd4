import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page-header';
import { SectionNav } from '@/components/ui/section-nav';
import { useDocumentTitle } from '@/lib/document-title';

const pages = [
  { to: '/console/books', label: 'At a glance', end: true },
  { to: '/console/books/reconcile', label: 'Reconcile' },
  { to: '/console/books/pledges', label: 'Pledges and refunds' },
  { to: '/console/books/disputes', label: 'Disputes' },
  { to: '/console/books/months', label: 'Months' },
];

/** Header and page row shared by every books page. */
export function BooksFrame({
  title,
  description,
  back,
  children,
}: {
  title: string;
  description?: ReactNode;
  /** A page inside a list (one pledge, one month): the way back to that list, under the title. */
  back?: { to: string; label: string };
  children: ReactNode;
}) {
  useDocumentTitle(title === 'Books' ? 'Books' : `${title} · Books`);
  const backLink = back && (
    <Link className="text-amber-300 underline underline-offset-2" to={back.to}>
      ← {back.label}
    </Link>
  );
  return (
    <>
      <PageHeader eyebrow={title === 'Books' ? 'Console' : 'Console · Books'} title={title} description={backLink ?? description} />
      <div className="mb-6">
        <SectionNav label="Books" links={pages} />
      </div>
      <div className="space-y-6">{children}</div>
    </>
  );
}
