import { useDeferredValue, useMemo, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { Spinner } from '@/components/ui/spinner';
import { TextField } from '@/components/ui/text-field';
import { useAccounts } from '@/features/admin/api/get-accounts';
import { AccountsTable } from '@/features/admin/components/accounts-table';
import { AuditLogPanel } from '@/features/admin/components/audit-log-panel';
import { getMeQueryOptions, useMe } from '@/features/auth/api/get-me';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';

export function Component() {
  useDocumentTitle('People');
  const me = useMe();
  const queryClient = useQueryClient();
  const [search, setSearch] = useState('');
  const q = useDeferredValue(search);
  const accounts = useAccounts({ q });

  const subjectNames = useMemo(() => new Map((accounts.data?.accounts ?? []).map((a) => [a.id, a.email] as const)), [accounts.data]);

  return (
    <>
      <PageHeader
        eyebrow="Console"
        title="People"
        description="Every account and the roles it holds. Each grant and revoke is written to the audit log."
      />
      <p className="mb-4 text-sm">
        <Link to="/console/people/mail-queue" className="underline">
          Mail queue
        </Link>{' '}
        — every message the product sends, and what the mail service answered.
      </p>
      <div className="space-y-6">
        <Card>
          <form role="search" onSubmit={(event) => event.preventDefault()} className="mb-5 max-w-md">
            <TextField
              label="Search accounts"
              type="search"
              placeholder="Name or e-mail"
              value={search}
              onChange={(event) => setSearch(event.target.value)}
              hint={accounts.isFetching && !accounts.isPending ? 'Searching…' : undefined}
            />
          </form>
          {accounts.isPending ? (
            <Spinner label="Loading accounts…" />
          ) : accounts.isError ? (
            <Alert title="Could not load accounts">{errorMessage(accounts.error)}</Alert>
          ) : accounts.data.accounts.length === 0 ? (
            <EmptyState title="No accounts match" description={q ? `Nothing matches “${q}”.` : 'No accounts yet.'} />
          ) : (
            <AccountsTable
              accounts={accounts.data.accounts}
              currentAccountId={me.data?.id}
              onRoleChanged={(account) => {
                // Changing your own roles changes what the console shows you.
                if (account.id === me.data?.id) queryClient.setQueryData(getMeQueryOptions().queryKey, account);
              }}
            />
          )}
        </Card>
        <AuditLogPanel subjectNames={subjectNames} />
      </div>
    </>
  );
}
