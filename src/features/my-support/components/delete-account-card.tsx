import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { deleteAccountSchema } from '@shared/schemas/campaign';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { ConfirmDialog } from '@/components/ui/confirm-dialog';
import { TextField } from '@/components/ui/text-field';
import { applyApiError } from '@/lib/form-errors';
import { useDeleteAccount } from '../api/delete-account';

type Values = z.input<typeof deleteAccountSchema>;

export function DeleteAccountCard({ email, onDeleted }: { email: string; onDeleted: () => void }) {
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<Values, unknown, z.output<typeof deleteAccountSchema>>({
    resolver: zodResolver(deleteAccountSchema),
    defaultValues: { confirmEmail: '' },
  });
  const remove = useDeleteAccount();
  const queryClient = useQueryClient();
  // The server's answer lands by the field it is about; anything else above the field.
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await remove.mutateAsync(values.confirmEmail);
      queryClient.clear();
      onDeleted();
    } catch (error) {
      setFormError(applyApiError(error, form.setError, { fields: ['confirmEmail'] }));
    }
  });
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
          setFormError(null);
          form.reset();
          remove.reset();
        }}
        onConfirm={() => void onSubmit()}
      >
        <p>This cannot be undone. Type your e-mail address ({email}) to confirm.</p>
        {formError && <Alert title="Not deleted">{formError}</Alert>}
        <TextField
          label="Your e-mail address"
          type="email"
          autoComplete="off"
          error={form.formState.errors.confirmEmail?.message}
          {...form.register('confirmEmail')}
        />
      </ConfirmDialog>
    </Card>
  );
}
