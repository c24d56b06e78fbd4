import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { useEmailPreferences } from '@/features/my-support/api/email-preferences';
import { EmailPreferencesForm } from '@/features/my-support/components/email-preferences-form';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';

export function Component() {
  useDocumentTitle('E-mail choices');
  const prefs = useEmailPreferences();
  return (
    <>
      <PageHeader
        eyebrow="My support"
        title="E-mail choices"
        description="Choose what we send you. Account messages such as password resets always arrive."
      />
      <Card className="max-w-2xl">
        {prefs.isPending ? (
          <PageSpinner />
        ) : prefs.isError ? (
          <Alert title="Could not load your choices">{errorMessage(prefs.error)}</Alert>
        ) : (
          <EmailPreferencesForm initial={prefs.data} />
        )}
      </Card>
    </>
  );
}
