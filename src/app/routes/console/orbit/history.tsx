import { Card } from '@/components/ui/card';
import { HistoryTable } from '@/features/orbit/components/history-table';
import { OrbitDeskFrame } from '@/features/orbit/components/orbit-desk-frame';

export function Component() {
  return (
    <OrbitDeskFrame
      title="Element-set history"
      description="Every stored set with its derived orbit, the file it came from, and whether the trend treats it as an outlier."
    >
      {(craft) =>
        craft ? (
          <Card>
            <HistoryTable spacecraftId={craft.id} />
          </Card>
        ) : null
      }
    </OrbitDeskFrame>
  );
}
