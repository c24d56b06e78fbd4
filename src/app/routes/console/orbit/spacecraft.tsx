import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { OrbitDeskFrame } from '@/features/orbit/components/orbit-desk-frame';
import { SpacecraftForm } from '@/features/orbit/components/spacecraft-form';

export function Component() {
  const [adding, setAdding] = useState(false);
  return (
    <OrbitDeskFrame
      title="Spacecraft record"
      description="What the drag and sail models need, and the catalog number that ties element sets to the craft."
      requireCraft={false}
      actions={
        <Button variant="secondary" onClick={() => setAdding((a) => !a)}>
          {adding ? 'Edit the current craft' : 'Add another craft'}
        </Button>
      }
    >
      {(craft) => (
        <Card>
          <CardHeader level={2} title={adding || !craft ? 'New spacecraft' : craft.name} />
          <SpacecraftForm key={adding || !craft ? 'new' : craft.id} craft={adding ? null : craft} onSaved={() => setAdding(false)} />
        </Card>
      )}
    </OrbitDeskFrame>
  );
}
