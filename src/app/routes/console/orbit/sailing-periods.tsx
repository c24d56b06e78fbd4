import { Alert } from '@/components/ui/alert';
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
        craft && !craft.hasSail ? (
          <Alert tone="info" title="Sailing periods do not apply">
            {craft.name} has no sail (sail area 0 m²): it is a comparison object, and its orbit changes by drag alone. Choose the mission
            craft above to log its sailing periods.
          </Alert>
        ) : craft ? (
          <Card>
            <SailingPeriodLog spacecraftId={craft.id} />
          </Card>
        ) : null
      }
    </OrbitDeskFrame>
  );
}
