import type { ConsoleSection } from '@/app/site-map/types';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { useDocumentTitle } from '@/lib/document-title';
import { roleLabels } from '@/lib/roles';

/** The landing page of a console section whose own pages have not been added to the site map yet. */
export function SectionLanding({ section }: { section: ConsoleSection }) {
  useDocumentTitle(section.title);
  return (
    <>
      <PageHeader eyebrow="Console" title={section.title} description={section.summary} />
      <Card>
        <h2 className="text-lg font-bold text-foil-50">What happens here</h2>
        <ul className="mt-3 space-y-2 text-foil-200">
          {section.duties.map((duty) => (
            <li key={duty} className="flex gap-3">
              <span aria-hidden="true" className="mt-2 size-1.5 shrink-0 rotate-45 bg-amber-400" />
              {duty}
            </li>
          ))}
        </ul>
        <p className="mt-5 text-sm text-foil-400">Open to: {section.roles.map((r) => roleLabels[r]).join(', ')}.</p>
      </Card>
    </>
  );
}
