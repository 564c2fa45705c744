import { RECORD_TEST_TYPE_LABELS, type RecordDto } from '@shared/schemas/records';
import { formatDate } from '@/lib/format';

/** "Slug test, slug out (rising-head), 3 Mar 2025": how a record is named in headings and legends. */
export function recordLabel(record: Pick<RecordDto, 'testType' | 'testDate'>): string {
  const type = RECORD_TEST_TYPE_LABELS[record.testType];
  return record.testDate ? `${type}, ${formatDate(record.testDate)}` : type;
}
