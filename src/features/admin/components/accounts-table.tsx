import { useState } from 'react';
import { roles, type AccountView, type Role } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { cn } from '@/lib/cn';
import { errorMessage } from '@/lib/form-errors';
import { roleLabels } from '@/lib/roles';
import { useGrantRole } from '../api/grant-role';
import { useRevokeRole } from '../api/revoke-role';

type PendingChange = { account: AccountView; role: Role; change: 'grant' | 'revoke' };

const roleDuties: Record<Role, string> = {
  backer: 'pledge to campaigns and see their own support',
  outreach: 'write, schedule and withdraw dispatches at the dispatch desk',
  engineer: 'load element sets and run analyses at the orbit desk',
  finance: 'see the ledger, refunds, payouts and reconciliation in the books',
  admin: 'manage every account and its roles in people',
};

const dateFormat = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' });

function RoleToggles({ account, onToggle }: { account: AccountView; onToggle: (change: PendingChange) => void }) {
  return (
    <div role="group" aria-label={`Roles for ${account.displayName}`} className="flex flex-wrap gap-1.5">
      {roles.map((role) => {
        const held = account.roles.includes(role);
        return (
          <button
            key={role}
            type="button"
            aria-pressed={held}
            onClick={() => onToggle({ account, role, change: held ? 'revoke' : 'grant' })}
            className={cn(
              'inline-flex min-h-8 items-center gap-1 rounded-full border px-3 text-xs font-semibold transition-colors',
              held
                ? 'border-amber-400 bg-amber-400/15 text-amber-200 hover:bg-amber-400/25'
                : 'border-foil-700 text-foil-400 hover:border-foil-400 hover:text-foil-100',
            )}
          >
            <span aria-hidden="true">{held ? '✓' : '+'}</span>
            {roleLabels[role]}
          </button>
        );
      })}
    </div>
  );
}

function AccountSummary({ account, isYou }: { account: AccountView; isYou: boolean }) {
  return (
    <>
      <div className="font-semibold text-foil-50">
        {account.displayName}
        {isYou && <span className="ml-2 text-xs font-normal text-foil-400">(you)</span>}
      </div>
      <div className="break-all text-foil-300">{account.email}</div>
      <div className="mt-1">
        {account.emailVerified ? <Badge tone="good">E-mail verified</Badge> : <Badge tone="attention">E-mail not verified</Badge>}
      </div>
    </>
  );
}

export function AccountsTable({
  accounts,
  currentAccountId,
  onRoleChanged,
}: {
  accounts: AccountView[];
  currentAccountId?: string;
  onRoleChanged?: (account: AccountView) => void;
}) {
  const [pending, setPending] = useState<PendingChange | null>(null);
  const [lastDone, setLastDone] = useState<string | null>(null);
  const grant = useGrantRole({ onSuccess: onRoleChanged });
  const revoke = useRevokeRole({ onSuccess: onRoleChanged });
  const mutation = pending?.change === 'revoke' ? revoke : grant;

  const open = (change: PendingChange) => {
    grant.reset();
    revoke.reset();
    setLastDone(null);
    setPending(change);
  };

  const confirm = async () => {
    if (!pending) return;
    const { account, role, change } = pending;
    try {
      await (change === 'grant' ? grant : revoke).mutateAsync({ accountId: account.id, role });
      setLastDone(
        change === 'grant'
          ? `${account.displayName} now holds the ${roleLabels[role]} role.`
          : `${account.displayName} no longer holds the ${roleLabels[role]} role.`,
      );
      setPending(null);
    } catch {
      // The error stays on the mutation and is shown inside the dialog.
    }
  };

  return (
    <>
      {lastDone && (
        <Alert tone="success" className="mb-4">
          {lastDone}
        </Alert>
      )}
      <ul className="divide-y divide-foil-800/70 rounded-xl border border-foil-700/60 sm:hidden" aria-label="Accounts and their roles">
        {accounts.map((account) => (
          <li key={account.id} className="space-y-3 p-4 text-sm">
            <div>
              <AccountSummary account={account} isYou={account.id === currentAccountId} />
            </div>
            <RoleToggles account={account} onToggle={open} />
          </li>
        ))}
      </ul>
      <Table caption="Accounts and their roles" className="hidden sm:block">
        <THead>
          <tr>
            <Th>Account</Th>
            <Th className="hidden md:table-cell">Joined</Th>
            <Th>Roles</Th>
          </tr>
        </THead>
        <TBody>
          {accounts.map((account) => (
            <Tr key={account.id}>
              <Td>
                <AccountSummary account={account} isYou={account.id === currentAccountId} />
              </Td>
              <Td className="hidden whitespace-nowrap text-foil-300 md:table-cell">
                <time dateTime={account.createdAt}>{dateFormat.format(new Date(account.createdAt))}</time>
              </Td>
              <Td>
                <RoleToggles account={account} onToggle={open} />
              </Td>
            </Tr>
          ))}
        </TBody>
      </Table>

      <ConfirmDialog
        open={pending !== null}
        title={
          pending
            ? pending.change === 'grant'
              ? `Grant ${roleLabels[pending.role]} to ${pending.account.displayName}?`
              : `Revoke ${roleLabels[pending.role]} from ${pending.account.displayName}?`
            : ''
        }
        confirmLabel={pending?.change === 'revoke' ? 'Revoke role' : 'Grant role'}
        tone={pending?.change === 'revoke' ? 'danger' : 'primary'}
        pending={mutation.isPending}
        onConfirm={confirm}
        onCancel={() => setPending(null)}
      >
        {pending && (
          <>
            <p>
              {pending.change === 'grant' ? 'With this role' : 'Without this role'}, {pending.account.email}{' '}
              {pending.change === 'grant' ? 'can' : 'can no longer'} {roleDuties[pending.role]}.
            </p>
            {pending.account.id === currentAccountId && pending.change === 'revoke' && (
              <p className="font-semibold text-amber-200">This is your own account.</p>
            )}
            <p className="text-foil-400">The change is recorded in the audit log.</p>
            {mutation.isError && <Alert>{errorMessage(mutation.error)}</Alert>}
          </>
        )}
      </ConfirmDialog>
    </>
  );
}
