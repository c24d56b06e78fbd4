import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import type { AccountView } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { applyApiError } from '@/lib/form-errors';
import { updateAccountInputSchema, useUpdateAccount } from '../api/update-account';

type Values = z.input<typeof updateAccountInputSchema>;

export function DisplayNameForm({ account, onSaved }: { account: AccountView; onSaved: (account: AccountView) => void }) {
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const form = useForm<Values, unknown, z.output<typeof updateAccountInputSchema>>({
    resolver: zodResolver(updateAccountInputSchema),
    defaultValues: { displayName: account.displayName },
  });
  const update = useUpdateAccount({ onSuccess: onSaved });

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setSaved(false);
    try {
      const { account: updated } = await update.mutateAsync(values);
      form.reset({ displayName: updated.displayName });
      setSaved(true);
    } catch (error) {
      setFormError(applyApiError(error, form.setError, { fields: ['displayName'] }));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError && <Alert title="Could not save">{formError}</Alert>}
      {saved && !form.formState.isDirty && <Alert tone="success">Display name saved.</Alert>}
      <TextField
        label="Display name"
        autoComplete="nickname"
        error={form.formState.errors.displayName?.message}
        {...form.register('displayName', { onChange: () => setSaved(false) })}
      />
      <Button type="submit" loading={update.isPending} disabled={!form.formState.isDirty}>
        Save display name
      </Button>
    </form>
  );
}
