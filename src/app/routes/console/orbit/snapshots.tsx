import { Card } from '@/components/ui/card';
import { useMe } from '@/features/auth/api/get-me';
import { OrbitDeskFrame } from '@/features/orbit/components/orbit-desk-frame';
import { SnapshotList } from '@/features/orbit/components/snapshot-list';

export function Component() {
  const me = useMe();
  return (
    <OrbitDeskFrame
      title="Snapshots"
      description="Frozen charts for dispatches, e-mail and download. A public snapshot keeps one stable link."
      requireCraft={false}
    >
      {() => (
        <Card>
          <SnapshotList meId={me.data?.id} isAdmin={!!me.data?.roles.includes('admin')} />
        </Card>
      )}
    </OrbitDeskFrame>
  );
}
