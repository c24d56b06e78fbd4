import { OrbitDeskFrame } from '@/features/orbit/components/orbit-desk-frame';
import { UploadPanel } from '@/features/orbit/components/upload-panel';

export function Component() {
  return (
    <OrbitDeskFrame
      title="Upload element sets"
      description="Drop a file, choose one or paste a few lines; check the preview, then import or cancel."
    >
      {(craft) => (craft ? <UploadPanel craft={craft} /> : null)}
    </OrbitDeskFrame>
  );
}
