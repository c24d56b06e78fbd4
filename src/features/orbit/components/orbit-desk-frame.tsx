import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { buttonClasses } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { Spinner } from '@/components/ui/spinner';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { useCurrentSpacecraft } from '../use-current-spacecraft';
import type { Spacecraft } from '../types';
import { OrbitDeskNav } from './orbit-desk-nav';

/** Header, tabs and the chosen spacecraft for every orbit-desk page. */
export function OrbitDeskFrame({
  title,
  description,
  actions,
  requireCraft = true,
  children,
}: {
  title: string;
  description?: ReactNode;
  actions?: ReactNode;
  requireCraft?: boolean;
  children: (craft: Spacecraft | null, choose: (id: string) => void) => ReactNode;
}) {
  useDocumentTitle(`${title} · Orbit desk`);
  const { list, all, current, choose } = useCurrentSpacecraft();
  return (
    <>
      <PageHeader
        eyebrow={current ? `Orbit desk · ${current.name}` : 'Orbit desk'}
        title={title}
        description={description}
        actions={actions}
      />
      <OrbitDeskNav all={all} current={current} onChoose={choose} />
      {list.isPending ? (
        <Spinner label="Loading spacecraft…" />
      ) : list.isError ? (
        <Alert title="Could not load the spacecraft">{errorMessage(list.error)}</Alert>
      ) : !current && requireCraft ? (
        <EmptyState
          title="No spacecraft yet"
          description="Add the craft's record first: its catalog number ties uploaded element sets to it."
          action={
            <Link to="/console/orbit/spacecraft" className={buttonClasses()}>
              Add a spacecraft
            </Link>
          }
        />
      ) : (
        children(current, choose)
      )}
    </>
  );
}
