import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { OrbitDeskFrame } from '@/features/orbit/components/orbit-desk-frame';
import { SpacecraftForm, type SpacecraftPrefill } from '@/features/orbit/components/spacecraft-form';

const PREFILL_KEYS = [
  'name',
  'slug',
  'catalogNumber',
  'internationalDesignator',
  'massKg',
  'sailAreaM2',
  'dragCoefficient',
  'dragAreaEdgeOnM2',
] as const;

export function Component() {
  // "Add this object as a spacecraft" from an upload arrives with ?add=1 and what the file says about the object.
  const [params, setParams] = useSearchParams();
  const prefill: SpacecraftPrefill = {};
  for (const k of PREFILL_KEYS) {
    const v = params.get(k);
    if (v !== null) prefill[k] = v;
  }
  const fromUpload = params.get('add') === '1';
  const [adding, setAdding] = useState(fromUpload);
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
      {(craft, choose) => (
        <Card>
          <CardHeader
            level={2}
            title={adding || !craft ? 'New spacecraft' : craft.name}
            description={
              adding && fromUpload
                ? 'Filled in from the uploaded file. Check the mass and areas (a comparison object may have no sail), then upload the file again for this object.'
                : undefined
            }
          />
          <SpacecraftForm
            key={adding || !craft ? 'new' : craft.id}
            craft={adding ? null : craft}
            prefill={adding ? prefill : undefined}
            onSaved={(saved) => {
              if (adding) {
                choose(saved.id);
                setParams({}, { replace: true });
              }
              setAdding(false);
            }}
          />
        </Card>
      )}
    </OrbitDeskFrame>
  );
}
