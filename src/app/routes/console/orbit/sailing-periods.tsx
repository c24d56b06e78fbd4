import { Card } from '@/components/ui/card';
import { OrbitDeskFrame } from '@/features/orbit/components/orbit-desk-frame';
import { SailingPeriodLog } from '@/features/orbit/components/sailing-period-log';

export function Component() {
  return (
    <OrbitDeskFrame
      title="Sailing-period log"
      description="Spans of time with one sail mode. The trend shades them and the sail yield compares raising with edge-on."
    >
      {(craft) =>
        craft ? (
          <Card>
            <SailingPeriodLog spacecraftId={craft.id} />
          </Card>
        ) : null
      }
    </OrbitDeskFrame>
  );
}
