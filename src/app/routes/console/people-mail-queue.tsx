import { Link } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page-header';
import { MailQueuePanel } from '@/features/admin/components/mail-queue-panel';
import { useDocumentTitle } from '@/lib/document-title';

export function Component() {
  useDocumentTitle('Mail queue');
  return (
    <>
      <PageHeader
        eyebrow="Console · People"
        title="Mail queue"
        description="Account mail, receipts, membership notices and dispatches: waiting, sent or failed, with what the mail service answered."
      />
      <p className="mb-4 text-sm">
        <Link to="/console/people" className="underline">
          Back to people
        </Link>
      </p>
      <MailQueuePanel />
    </>
  );
}
