import { Link } from 'react-router-dom';
import { sectionsFor } from '@/app/site-map/console-sections';
import { PageHeader } from '@/components/ui/page-header';
import { useMe } from '@/features/auth/api/get-me';
import { useDocumentTitle } from '@/lib/document-title';
import { roleLabels, sortRoles } from '@/lib/roles';

export function Component() {
  useDocumentTitle('Console');
  const me = useMe();
  const account = me.data;
  if (!account) return null;
  const sections = sectionsFor(account.roles);
  return (
    <>
      <PageHeader
        eyebrow="Console"
        title="Your desks"
        description={`Signed in as ${account.displayName} · ${sortRoles(account.roles)
          .map((r) => roleLabels[r])
          .join(', ')}`}
      />
      <ul className="grid gap-4 sm:grid-cols-2">
        {sections.map((section) => (
          <li key={section.id}>
            <Link
              to={`/console/${section.path}`}
              className="block h-full rounded-2xl border border-foil-700/60 bg-night-900/80 p-5 transition-colors hover:border-amber-400/60 hover:bg-night-800/80"
            >
              <span className="block text-lg font-bold text-foil-50">{section.title}</span>
              <span className="mt-1 block text-sm text-foil-300">{section.summary}</span>
            </Link>
          </li>
        ))}
      </ul>
    </>
  );
}
