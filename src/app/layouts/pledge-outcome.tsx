import type { ReactNode } from 'react';
import { Link, useParams } from 'react-router-dom';
import type { PledgeView } from '@shared/schemas/campaign';
import { buttonClasses } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { PledgeSummary } from '@/features/pledges/components/pledge-summary';
import { useDocumentTitle } from '@/lib/document-title';
import { RequireAccount } from './require-account';

export const isPaidPledge = (p: PledgeView) => p.state === 'paid' || p.state === 'partly_refunded';

/** A page the checkout sends the backer back to, for the pledge named in the address. */
export function PledgeOutcomePage({ documentTitle, children }: { documentTitle: string; children: (pledgeId: string) => ReactNode }) {
  useDocumentTitle(documentTitle);
  const { id = '' } = useParams();
  return (
    <div className="mx-auto max-w-2xl px-4 py-8 sm:px-6 md:py-12">
      <RequireAccount>{() => children(id)}</RequireAccount>
    </div>
  );
}

export function PledgeOutcome({
  pledge,
  title,
  notice,
  next,
}: {
  pledge: PledgeView;
  title: string;
  notice: ReactNode;
  next: { to: string; label: string };
}) {
  return (
    <>
      <PageHeader eyebrow={pledge.campaign.title} title={title} />
      <Card className="space-y-5">
        {notice}
        <PledgeSummary pledge={pledge} />
        <div className="flex flex-wrap gap-3">
          <Link to={next.to} className={buttonClasses()}>
            {next.label}
          </Link>
          <Link to="/campaign" className={buttonClasses({ variant: 'secondary' })}>
            Back to the campaign
          </Link>
        </div>
      </Card>
    </>
  );
}
