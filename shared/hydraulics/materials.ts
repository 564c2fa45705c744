import type { UnitOption } from '../units/unit-option';

export type MaterialId =
  | 'gravel'
  | 'clean-sand'
  | 'silty-sand'
  | 'silt-loess'
  | 'glacial-till'
  | 'unweathered-marine-clay'
  | 'karst-limestone'
  | 'permeable-basalt'
  | 'fractured-igneous-metamorphic'
  | 'limestone-dolomite'
  | 'sandstone'
  | 'unfractured-igneous-metamorphic'
  | 'shale';

export interface Material extends UnitOption<MaterialId> {
  kMinMetersPerSecond: number;
  kMaxMetersPerSecond: number;
  reference: string;
}

const TABLE = 'Freeze & Cherry (1979), Table 2.2';
const TABLE_MEMORY = 'Freeze & Cherry (1979), Table 2.2 (memory)';

/** Ranges of K by material; the first five as quoted in Kfield's method notes, the rest recalled. */
export const MATERIALS: readonly Material[] = [
  { id: 'gravel', label: 'Gravel', kMinMetersPerSecond: 1e-3, kMaxMetersPerSecond: 1, reference: TABLE },
  { id: 'clean-sand', label: 'Clean sand', kMinMetersPerSecond: 1e-6, kMaxMetersPerSecond: 1e-2, reference: TABLE },
  { id: 'silty-sand', label: 'Silty sand', kMinMetersPerSecond: 1e-7, kMaxMetersPerSecond: 1e-3, reference: TABLE },
  { id: 'silt-loess', label: 'Silt, loess', kMinMetersPerSecond: 1e-9, kMaxMetersPerSecond: 1e-5, reference: TABLE },
  { id: 'glacial-till', label: 'Glacial till', kMinMetersPerSecond: 1e-12, kMaxMetersPerSecond: 1e-6, reference: TABLE },
  { id: 'unweathered-marine-clay', label: 'Unweathered marine clay', kMinMetersPerSecond: 1e-13, kMaxMetersPerSecond: 1e-9, reference: TABLE_MEMORY },
  { id: 'karst-limestone', label: 'Karst limestone', kMinMetersPerSecond: 1e-6, kMaxMetersPerSecond: 1e-2, reference: TABLE_MEMORY },
  { id: 'permeable-basalt', label: 'Permeable basalt', kMinMetersPerSecond: 1e-7, kMaxMetersPerSecond: 1e-2, reference: TABLE_MEMORY },
  { id: 'fractured-igneous-metamorphic', label: 'Fractured igneous and metamorphic rock', kMinMetersPerSecond: 1e-8, kMaxMetersPerSecond: 1e-4, reference: TABLE_MEMORY },
  { id: 'limestone-dolomite', label: 'Limestone and dolomite', kMinMetersPerSecond: 1e-9, kMaxMetersPerSecond: 1e-5, reference: TABLE_MEMORY },
  { id: 'sandstone', label: 'Sandstone', kMinMetersPerSecond: 1e-10, kMaxMetersPerSecond: 1e-6, reference: TABLE_MEMORY },
  { id: 'unfractured-igneous-metamorphic', label: 'Unfractured igneous and metamorphic rock', kMinMetersPerSecond: 1e-14, kMaxMetersPerSecond: 1e-10, reference: TABLE_MEMORY },
  { id: 'shale', label: 'Shale', kMinMetersPerSecond: 1e-13, kMaxMetersPerSecond: 1e-9, reference: TABLE_MEMORY },
];

export function findMaterial(id: string): Material | undefined {
  return MATERIALS.find((m) => m.id === id);
}
