import { useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { TextField } from '@/components/ui/text-field';
import { errorMessage } from '@/lib/form-errors';
import { useDeleteAccount } from '../api/delete-account';

export function DeleteAccountCard({ email, onDeleted }: { email: string; onDeleted: () => void }) {
  const [open, setOpen] = useState(false);
  const [typed, setTyped] = useState('');
  const remove = useDeleteAccount();
  const queryClient = useQueryClient();
  return (
    <Card>
      <CardHeader
        title="Delete my account"
        description="Your sign-in, name and e-mail address are removed and every session ends. Pledge records stay in the books without your name, because payments must be kept; live crew memberships are stopped at once."
      />
      <Button variant="danger" onClick={() => setOpen(true)}>
        Delete my account…
      </Button>
      <ConfirmDialog
        open={open}
        title="Delete your account for good?"
        confirmLabel="Delete my account"
        tone="danger"
        pending={remove.isPending}
        onCancel={() => {
          setOpen(false);
          remove.reset();
        }}
        onConfirm={() =>
          remove.mutate(typed, {
            onSuccess: () => {
              queryClient.clear();
              onDeleted();
            },
          })
        }
      >
        <p>This cannot be undone. Type your e-mail address ({email}) to confirm.</p>
        <TextField label="Your e-mail address" type="email" autoComplete="off" value={typed} onChange={(e) => setTyped(e.target.value)} />
        {remove.isError && <Alert title="Not deleted">{errorMessage(remove.error)}</Alert>}
      </ConfirmDialog>
    </Card>
  );
}
