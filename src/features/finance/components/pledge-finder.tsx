import { useDeferredValue, useState } from 'react';
import { Link } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Card } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { Table, TBody, THead, Td, Th, Tr } from '@/components/ui/table';
import { TextField } from '@/components/ui/text-field';
import { errorMessage } from '@/lib/form-errors';
import { money } from '@/lib/money';
import { pledgeStateLabels } from '@/lib/pledge-state';
import { usePledges } from '../api/get-pledges';

/** Finds a pledge by the backer's e-mail or name, or its id; each row opens the pledge's page in books. */
export function PledgeFinder() {
  const [q, setQ] = useState('');
  const search = useDeferredValue(q.trim());
  const list = usePledges(search);
  const shown = list.data?.slice(0, 50) ?? [];
  // The campaign is a column only when the list spans more than one.
  const manyCampaigns = new Set(shown.map((p) => p.campaignTitle)).size > 1;
  return (
    <Card>
      <h2 className="text-lg font-bold text-foil-50">Find a pledge</h2>
      <div className="mt-3 max-w-md">
        <TextField label="Backer’s e-mail or name, or the pledge id" type="search" value={q} onChange={(e) => setQ(e.target.value)} />
      </div>
      {list.isPending ? (
        <Spinner label="Loading pledges" />
      ) : list.isError ? (
        <Alert className="mt-3" title="Could not load pledges">
          {errorMessage(list.error)}
        </Alert>
      ) : shown.length === 0 ? (
        <EmptyState title="No pledge matches" description={search ? `Nothing matches “${search}”.` : 'No pledge has been paid yet.'} />
      ) : (
        <>
          <Table caption="Pledges, newest first" className="mt-4">
            <THead>
              <Tr>
                <Th>Amount</Th>
                <Th>Backer</Th>
                {manyCampaigns && <Th>For</Th>}
                <Th>State</Th>
              </Tr>
            </THead>
            <TBody>
              {shown.map((p) => (
                <Tr key={p.id}>
                  <Td className="whitespace-nowrap">
                    <Link className="font-semibold text-amber-300 underline underline-offset-2" to={`/console/books/pledges/${p.id}`}>
                      {money(p.amountMinor, p.currency)}
                    </Link>
                  </Td>
                  <Td>{p.backer ? (p.backer.name ?? p.backer.email) : <span className="text-foil-400">anonymised</span>}</Td>
                  {manyCampaigns && <Td>{p.campaignTitle}</Td>}
                  <Td>
                    <Badge tone={p.state === 'paid' ? 'good' : 'neutral'}>{pledgeStateLabels[p.state]}</Badge>
                  </Td>
                </Tr>
              ))}
            </TBody>
          </Table>
          {(list.data?.length ?? 0) > shown.length && (
            <p className="mt-2 text-sm text-foil-300">
              Showing the newest {shown.length} of {list.data?.length}; narrow the search to see others.
            </p>
          )}
        </>
      )}
    </Card>
  );
}
