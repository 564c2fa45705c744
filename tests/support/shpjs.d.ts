// shpjs ships no types; the parts the exports tests use.
declare module 'shpjs' {
  import type { FeatureCollection, Geometry } from 'geojson';
  type Bytes = ArrayBuffer | Uint8Array | Buffer;
  export default function getShapefile(zip: Bytes): Promise<FeatureCollection & { fileName?: string }>;
  export function parseShp(shp: Bytes, prj?: string | false): Geometry[];
  export function parseDbf(dbf: Bytes, cpg?: string): Record<string, unknown>[];
}
