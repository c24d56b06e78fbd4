import { useQueryClient } from '@tanstack/react-query';
import type { AccountView } from '@shared/schemas/auth';
import { Badge } from '@/components/ui/badge';
import { Card, CardHeader } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { DisplayNameForm } from '@/features/account/components/display-name-form';
import { EmailStatus } from '@/features/account/components/email-status';
import { getMeQueryOptions, useMe } from '@/features/auth/api/get-me';
import { useDocumentTitle } from '@/lib/document-title';
import { roleLabels, sortRoles } from '@/lib/roles';

const dateFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'long' });

export function Component() {
  useDocumentTitle('Your account');
  const me = useMe();
  const queryClient = useQueryClient();
  const account = me.data;
  if (!account) return <PageSpinner />;

  const onSaved = (updated: AccountView) => queryClient.setQueryData(getMeQueryOptions().queryKey, updated);

  return (
    <>
      <PageHeader eyebrow="My support" title={`Hello, ${account.displayName}`} description="Your profile and how we reach you." />
      <div className="grid gap-6 lg:grid-cols-2">
        <Card>
          <CardHeader title="Profile" />
          <dl className="mb-6 grid grid-cols-[auto_1fr] gap-x-6 gap-y-2 text-sm">
            <dt className="text-foil-400">Member since</dt>
            <dd className="text-foil-100">
              <time dateTime={account.createdAt}>{dateFormat.format(new Date(account.createdAt))}</time>
            </dd>
            <dt className="text-foil-400">Roles</dt>
            <dd className="flex flex-wrap gap-1.5">
              {sortRoles(account.roles).map((role) => (
                <Badge key={role}>{roleLabels[role]}</Badge>
              ))}
            </dd>
          </dl>
          <DisplayNameForm key={account.id} account={account} onSaved={onSaved} />
        </Card>
        <Card>
          <CardHeader title="E-mail" description="Receipts, verification and password resets go to this address." />
          <EmailStatus account={account} />
        </Card>
      </div>
    </>
  );
}
