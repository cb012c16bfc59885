import { PageHeader } from '../../../components/ui/page-header.tsx';
import { UploadPanel } from '../../../features/uploads/components/upload-panel.tsx';

export function UploadsRoute() {
  return (
    <div className="flex min-h-0 flex-1 flex-col gap-4 p-4 sm:px-6 sm:py-5">
      <title>Uploads · Turnstone</title>
      <PageHeader
        title="Uploads"
        description="Recordings from a portable instrument, analysed like gateway snapshots. The file's content decides its format."
      />
      <UploadPanel />
    </div>
  );
}
