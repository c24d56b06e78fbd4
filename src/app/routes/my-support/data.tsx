import { useNavigate } from 'react-router-dom';
import { Card, CardHeader } from '@/components/ui/card';
import { buttonClasses } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { useMe } from '@/features/auth/api/get-me';
import { exportDataUrl } from '@/features/my-support/api/delete-account';
import { DeleteAccountCard } from '@/features/my-support/components/delete-account-card';
import { useDocumentTitle } from '@/lib/document-title';

export function Component() {
  useDocumentTitle('Your data');
  const me = useMe();
  const navigate = useNavigate();
  return (
    <>
      <PageHeader
        eyebrow="My support"
        title="Your data"
        description="Take a copy of everything we hold about you, or close your account."
      />
      <div className="grid max-w-3xl gap-6">
        <Card>
          <CardHeader
            title="Download my data"
            description="One JSON file: your account, sign-in methods, e-mail choices, pledges with their payments, memberships and your recent activity."
          />
          <a href={exportDataUrl} download className={buttonClasses({ variant: 'secondary' })}>
            Download my data (JSON)
          </a>
        </Card>
        {me.data && <DeleteAccountCard email={me.data.email} onDeleted={() => navigate('/', { replace: true })} />}
      </div>
    </>
  );
}
