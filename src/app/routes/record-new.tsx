import { useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useNavigate, useParams } from 'react-router-dom';
import type { RecordDto } from '@shared/schemas/records';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { QueryBoundary } from '@/components/ui/error-boundary';
import { PageHeader } from '@/components/ui/page-header';
import { useToast } from '@/components/ui/toast';
import { createTapeRecord, invalidateWellRecords, recordKeys } from '@/features/records/api';
import { levelUnitFor } from '@/features/records/format';
import { LoggerUploadForm } from '@/features/records/components/logger-upload-form';
import { TapeReadingsForm } from '@/features/records/components/tape-readings-form';
import { siteQueryOptions } from '@/features/sites/api';
import { wellQueryOptions } from '@/features/wells/api';
import { useDocumentTitle } from '@/lib/use-document-title';

type Kind = 'tape' | 'logger';

const TEXT: Record<Kind, { title: string; description: string }> = {
  tape: {
    title: 'Add tape readings',
    description: 'Type the depth-to-water readings of one test (or paste them from a spreadsheet); Kfield reduces them to H/H0 when you save.',
  },
  logger: {
    title: 'Upload a logger file',
    description: 'Any CSV or text export: Kfield reads its layout, shows what it found for you to confirm, and keeps the file as uploaded.',
  },
};

function NewRecord({ kind }: { kind: Kind }) {
  const { siteId = '', wellId = '' } = useParams();
  const { data: site } = useSuspenseQuery(siteQueryOptions(siteId));
  const { data: well } = useSuspenseQuery(wellQueryOptions(wellId));
  const text = TEXT[kind];
  useDocumentTitle(`${text.title} · ${well.name}`);
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const toast = useToast();
  const back = () => void navigate(`/sites/${site.id}/wells/${well.id}`);
  const saved = async (record: RecordDto) => {
    queryClient.setQueryData(recordKeys.detail(record.id), record);
    await invalidateWellRecords(queryClient, well.id);
    toast.success(`Record saved: ${record.sampleCount.toLocaleString('en-US')} readings.`);
    await navigate(`/sites/${site.id}/records/${record.id}`);
  };
  return (
    <>
      <PageHeader
        title={text.title}
        crumbs={[
          { label: 'Sites', to: '/' },
          { label: site.name, to: `/sites/${site.id}` },
          { label: 'Wells', to: `/sites/${site.id}/wells` },
          { label: well.name, to: `/sites/${site.id}/wells/${well.id}` },
          { label: kind === 'tape' ? 'Tape readings' : 'Logger file' },
        ]}
        description={text.description}
      />
      <Card aria-labelledby="new-record">
        <CardHeader titleId="new-record" title={`${well.name}: ${kind === 'tape' ? 'tape readings' : 'logger file'}`} />
        <CardBody>
          {kind === 'tape' ? (
            <TapeReadingsForm
              defaultUnit={levelUnitFor(site.displayUnits)}
              onCancel={back}
              onSubmit={async (body) => {
                const record = await createTapeRecord(well.id, body);
                await saved(record);
                return record;
              }}
            />
          ) : (
            <LoggerUploadForm wellId={well.id} defaultUnit={levelUnitFor(site.displayUnits)} onCancel={back} onUploaded={(r) => void saved(r)} />
          )}
        </CardBody>
      </Card>
    </>
  );
}

export function NewTapeRecordRoute() {
  return (
    <QueryBoundary loadingLabel="Loading the well…">
      <NewRecord kind="tape" />
    </QueryBoundary>
  );
}

export function NewLoggerRecordRoute() {
  return (
    <QueryBoundary loadingLabel="Loading the well…">
      <NewRecord kind="logger" />
    </QueryBoundary>
  );
}
