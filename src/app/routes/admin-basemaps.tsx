import { lazy, Suspense } from 'react';
import { useSuspenseQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useToast } from '@/components/ui/toast';
import { adminBasemapsQueryOptions } from '@/features/basemaps/api';
import { BasemapsTable } from '@/features/basemaps/components/basemaps-table';
import { UploadBasemapForm } from '@/features/basemaps/components/upload-basemap-form';
import { LoadingBlock } from '@/components/ui/spinner';
import { useDocumentTitle } from '@/lib/use-document-title';

// maplibre-gl is large: it loads with the preview, not with every page.
const BasemapPreview = lazy(() => import('@/features/basemaps/components/basemap-preview').then((m) => ({ default: m.BasemapPreview })));

export function AdminBasemapsRoute() {
  useDocumentTitle('Basemaps');
  const toast = useToast();
  const [params, setParams] = useSearchParams();
  const previewId = params.get('preview');
  const preview = (id: string) => setParams({ preview: id });
  return (
    <>
      <PageHeader
        title="Basemaps"
        crumbs={[{ label: 'Admin' }, { label: 'Basemaps' }]}
        description="The maps drawn under the wells. The built-in basemap covers the world at small scales and Kfield’s invented demo area in detail; upload a vector MBTiles file to bring your own region, then choose it per site or as the instance default."
      />
      <div className="space-y-6">
        <Card aria-labelledby="basemaps-title">
          <CardHeader titleId="basemaps-title" title="Basemaps on this instance" />
          <QueryBoundary loadingLabel="Loading basemaps…" errorTitle="The basemaps could not be loaded">
            <BasemapsTable previewId={previewId} onPreview={preview} />
          </QueryBoundary>
        </Card>
        <Card aria-labelledby="basemap-preview-title">
          <QueryBoundary loadingLabel="Loading the preview…" errorTitle="The preview could not be loaded">
            <Preview previewId={previewId} />
          </QueryBoundary>
        </Card>
        <Card aria-labelledby="upload-basemap-title">
          <CardHeader
            titleId="upload-basemap-title"
            title="Upload a basemap"
            description="Kfield checks that the file is an MBTiles file with vector tiles and keeps nothing when it is not."
          />
          <CardBody>
            <div className="max-w-2xl">
              <UploadBasemapForm
                onUploaded={(b) => {
                  toast.success(`${b.name} was uploaded: zooms ${b.metadata.minzoom}–${b.metadata.maxzoom}.`);
                  preview(b.id);
                }}
              />
            </div>
          </CardBody>
        </Card>
      </div>
    </>
  );
}

function Preview({ previewId }: { previewId: string | null }) {
  const { data: basemaps } = useSuspenseQuery(adminBasemapsQueryOptions());
  const basemap = basemaps.find((b) => b.id === previewId) ?? basemaps[0];
  return (
    <>
      <CardHeader titleId="basemap-preview-title" title={basemap ? `Preview: ${basemap.name}` : 'Preview'} />
      <CardBody>
        {basemap ? (
          <Suspense fallback={<LoadingBlock label="Loading the map…" />}>
            <BasemapPreview basemap={basemap} />
          </Suspense>
        ) : (
          <p className="text-sm text-slate-600">There is no basemap to preview yet.</p>
        )}
      </CardBody>
    </>
  );
}
