/** Written in every cell outside the outline or beyond the search radius (and named in GDAL_NODATA). */
export const GEOTIFF_NODATA = -9999;

export interface GeoTiffRaster {
  /** Row-major from the north-west cell. NaN becomes GEOTIFF_NODATA. */
  values: Float32Array;
  cols: number;
  rows: number;
  /** The north-west corner of the north-west cell, in the CRS's units. */
  originX: number;
  originY: number;
  /** Cell width and height in the CRS's units (degrees for a geographic CRS). */
  pixelX: number;
  pixelY: number;
  epsgCode: number;
  geographic: boolean;
  citation: string;
  /** Text for the ImageDescription tag (the settings and the cautions), written as ASCII. */
  description: string;
}

const SHORT = 3;
const LONG = 4;
const ASCII = 2;
const DOUBLE = 12;
const SIZE: Record<number, number> = { [ASCII]: 1, [SHORT]: 2, [LONG]: 4, [DOUBLE]: 8 };

interface Tag {
  id: number;
  type: number;
  values: number[] | string;
}

/**
 * A single-band float32 GeoTIFF, little-endian, uncompressed in one strip. TIFF 6.0 baseline tags
 * plus the GeoTIFF 1.0 ones: ModelPixelScale, ModelTiepoint (pixel 0,0 at the north-west corner),
 * a GeoKeyDirectory (GTModelType, RasterPixelIsArea, the citation, ProjectedCSTypeGeoKey or
 * GeographicTypeGeoKey with the site's EPSG code) and GDAL's GDAL_NODATA. Written here rather than
 * with geotiff.js, whose writer keeps a fixed 1,000 bytes for the tags and so cannot carry the
 * cautions in ImageDescription; the tests read it back with geotiff.js and hold it to that writer.
 */
export function writeGeoTiff(r: GeoTiffRaster): Buffer {
  const citation = `${asciiOnly(r.citation)}|`;
  const geoKeys = [
    1, 1, 0, 4,
    1024, 0, 1, r.geographic ? 2 : 1, // GTModelTypeGeoKey: projected or geographic
    1025, 0, 1, 1, // GTRasterTypeGeoKey: RasterPixelIsArea
    r.geographic ? 2049 : 1026, 34737, citation.length, 0, // GeogCitationGeoKey or GTCitationGeoKey, in GeoAsciiParams
    r.geographic ? 2048 : 3072, 0, 1, r.epsgCode, // GeographicTypeGeoKey or ProjectedCSTypeGeoKey
  ];
  if (r.epsgCode < 1 || r.epsgCode > 65535) throw new Error(`EPSG:${r.epsgCode} does not fit a GeoKey`);
  const stripBytes = r.cols * r.rows * 4;
  const tags: Tag[] = [
    { id: 256, type: LONG, values: [r.cols] },
    { id: 257, type: LONG, values: [r.rows] },
    { id: 258, type: SHORT, values: [32] },
    { id: 259, type: SHORT, values: [1] },
    { id: 262, type: SHORT, values: [1] },
    { id: 270, type: ASCII, values: asciiOnly(r.description) },
    { id: 273, type: LONG, values: [0] }, // StripOffsets: set below
    { id: 277, type: SHORT, values: [1] },
    { id: 278, type: LONG, values: [r.rows] },
    { id: 279, type: LONG, values: [stripBytes] },
    { id: 284, type: SHORT, values: [1] },
    { id: 305, type: ASCII, values: 'Kfield' },
    { id: 339, type: SHORT, values: [3] }, // SampleFormat: IEEE float
    { id: 33550, type: DOUBLE, values: [r.pixelX, r.pixelY, 0] },
    { id: 33922, type: DOUBLE, values: [0, 0, 0, r.originX, r.originY, 0] },
    { id: 34735, type: SHORT, values: geoKeys },
    { id: 34737, type: ASCII, values: citation },
    { id: 42113, type: ASCII, values: String(GEOTIFF_NODATA) },
  ];
  const count = (t: Tag) => (typeof t.values === 'string' ? t.values.length + 1 : t.values.length);
  const ifdBytes = 2 + tags.length * 12 + 4;
  let extra = 0;
  for (const t of tags) {
    const n = count(t) * SIZE[t.type];
    if (n > 4) extra += n + (n % 2);
  }
  const dataOffset = Math.ceil((8 + ifdBytes + extra) / 4) * 4;
  (tags.find((t) => t.id === 273)!.values as number[])[0] = dataOffset;
  const buf = Buffer.alloc(dataOffset + stripBytes);
  buf.write('II', 0, 'latin1');
  buf.writeUInt16LE(42, 2);
  buf.writeUInt32LE(8, 4);
  let p = 8;
  buf.writeUInt16LE(tags.length, p);
  p += 2;
  let out = 8 + ifdBytes;
  for (const t of tags) {
    const n = count(t);
    const bytes = n * SIZE[t.type];
    buf.writeUInt16LE(t.id, p);
    buf.writeUInt16LE(t.type, p + 2);
    buf.writeUInt32LE(n, p + 4);
    let at = p + 8;
    if (bytes > 4) {
      buf.writeUInt32LE(out, p + 8);
      at = out;
      out += bytes + (bytes % 2);
    }
    if (typeof t.values === 'string') buf.write(`${t.values}\0`, at, 'latin1');
    else
      t.values.forEach((v, i) => {
        if (t.type === SHORT) buf.writeUInt16LE(v, at + i * 2);
        else if (t.type === LONG) buf.writeUInt32LE(v, at + i * 4);
        else buf.writeDoubleLE(v, at + i * 8);
      });
    p += 12;
  }
  buf.writeUInt32LE(0, p); // no next IFD
  for (let i = 0; i < r.values.length; i++) buf.writeFloatLE(Number.isFinite(r.values[i]) ? r.values[i] : GEOTIFF_NODATA, dataOffset + i * 4);
  return buf;
}

/** TIFF ASCII is 7-bit: typographic quotes and dashes become plain ones, accents are dropped. */
export function asciiOnly(s: string): string {
  return s
    .replace(/[\u2018\u2019]/g, "'")
    .replace(/[\u201c\u201d]/g, '"')
    .replace(/[\u2013\u2014]/g, '-')
    .replace(/\u00b2/g, '2')
    .replace(/\u00b0/g, ' deg')
    .normalize('NFKD')
    .replace(/[^\x20-\x7e\n]/g, '');
}
