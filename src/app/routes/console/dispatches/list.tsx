import { Link } from 'react-router-dom';
import { AUDIENCE_LABEL, DISPATCH_STATE_LABEL } from '@shared/schemas/dispatch';
import { Badge } from '@/components/ui/badge';
import { PageHeader } from '@/components/ui/page-header';
import { PageLoadError } from '@/components/ui/page-load-error';
import { Spinner } from '@/components/ui/spinner';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { useDocumentTitle } from '@/lib/document-title';
import { useDispatches } from '@/features/dispatches/api/get-dispatches';

export function Component() {
  useDocumentTitle('Dispatch desk');
  const q = useDispatches();
  return (
    <div>
      <PageHeader
        eyebrow="Console"
        title="Dispatch desk"
        description="Write mission updates, pick who reads them, and send them out."
        actions={
          <Link className="rounded-md bg-amber-400 px-4 py-2 font-bold text-night-950" to="/console/dispatches/new">
            Write a dispatch
          </Link>
        }
      />
      {q.isPending ? (
        <Spinner label="Loading dispatches…" />
      ) : q.isError ? (
        <PageLoadError title="Dispatches could not load" error={q.error} onRetry={() => void q.refetch()} />
      ) : (
        <Table caption="Dispatches, newest change first">
          <THead>
            <Tr>
              <Th>Title</Th>
              <Th>State</Th>
              <Th>Audience</Th>
              <Th>Published</Th>
            </Tr>
          </THead>
          <TBody>
            {q.data.dispatches.map((d) => (
              <Tr key={d.id}>
                <Td>
                  <Link className="text-amber-300 underline" to={`/console/dispatches/${d.id}`}>
                    {d.title}
                  </Link>
                </Td>
                <Td>
                  <Badge>{DISPATCH_STATE_LABEL[d.state]}</Badge>
                </Td>
                <Td>{AUDIENCE_LABEL[d.audience.kind]}</Td>
                <Td>
                  {d.publishedAt ? new Date(d.publishedAt).toUTCString() : d.publishAt ? `due ${new Date(d.publishAt).toUTCString()}` : '—'}
                </Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      )}
    </div>
  );
}
