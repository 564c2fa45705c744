// @vitest-environment happy-dom
import { describe, expect, it } from 'vitest';
import { pastedCells, tapeBody, type TapeFormValues } from '@/features/records/components/tape-readings-form';

const values = (rows: { time: string; depth: string }[], over: Partial<TapeFormValues> = {}): TapeFormValues => ({
  testType: 'bail-down',
  timeFormat: 'mm:ss',
  units: 'ft',
  staticLevel: '',
  testStart: '',
  testDate: '',
  fieldCrew: '',
  notes: '',
  slugVolume: '',
  slugVolumeUnit: 'L',
  rows,
  ...over,
});

describe('tape readings typed or pasted into the grid', () => {
  it('splits a block pasted from a spreadsheet into rows of time and depth, dropping a header row', () => {
    expect(pastedCells('Time\tDepth (ft)\r\n0:00\t14.87\r\n0:01\t14.59\r\n')).toEqual([
      ['0:00', '14.87'],
      ['0:01', '14.59'],
    ]);
    expect(pastedCells('0;14,87\n1;14,59')).toEqual([
      ['0', '14,87'],
      ['1', '14,59'],
    ]);
    expect(pastedCells('14.87\n14.59\n')).toEqual([['14.87'], ['14.59']]);
  });

  it('sends only the filled rows, reads decimal commas, and maps each reading back to its grid row', () => {
    const { body, rowOf } = tapeBody(
      values([{ time: '0:00', depth: '14,87' }, { time: '', depth: '' }, { time: '0:10', depth: '14.2' }, { time: '', depth: '' }], { staticLevel: '13,99', slugVolume: '2' }),
    );
    expect(body.readings).toEqual([
      { time: '0:00', depth: 14.87 },
      { time: '0:10', depth: 14.2 },
    ]);
    expect(rowOf).toEqual([0, 2]);
    expect(body.static).toBe(13.99);
    expect(body.slugVolume).toEqual({ value: 2, unit: 'L' });
    expect(body).not.toHaveProperty('testStart');
  });

  it('sends times in seconds or minutes as numbers, and a missing depth as not a number for the schema to name', () => {
    const { body } = tapeBody(values([{ time: '0', depth: '3.1' }, { time: '1,5', depth: '' }], { timeFormat: 'min', testStart: '0.5' }));
    expect(body.readings[1].time).toBe(1.5);
    expect(body.readings[1].depth).toBeNaN();
    expect(body.testStart).toBe(0.5);
  });
});
