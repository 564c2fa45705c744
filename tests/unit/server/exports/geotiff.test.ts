import { fromArrayBuffer, writeArrayBuffer } from 'geotiff';
import { describe, expect, it } from 'vitest';
import { GEOTIFF_NODATA, writeGeoTiff } from '../../../../server/features/exports/geotiff';

const ab = (b: Buffer | ArrayBuffer) => (b instanceof ArrayBuffer ? b : (b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer));

async function read(b: Buffer | ArrayBuffer) {
  const image = await (await fromArrayBuffer(ab(b))).getImage();
  const [band] = (await image.readRasters()) as unknown as [Float32Array];
  return { image, band };
}

describe('the GeoTIFF writer', () => {
  const values = new Float32Array([-4.5, -4.25, Number.NaN, -3.1, -5, -6.123456]);
  const raster = { values, cols: 3, rows: 2, originX: 500_000, originY: 5_290_000, pixelX: 10, pixelY: 10, epsgCode: 32632, geographic: false, citation: 'WGS 84 / UTM zone 32N', description: 'short' };

  it('reads back in geotiff.js as geotiff.js’s own writer does: size, cells, origin, pixel size, GeoKeys, nodata', async () => {
    const ours = await read(writeGeoTiff(raster));
    // The reference: geotiff.js's writer with the same tags (its header room is enough for a short description).
    const reference = await read(
      writeArrayBuffer(new Float32Array(values.map((v) => (Number.isNaN(v) ? GEOTIFF_NODATA : v))), {
        width: 3, height: 2, ModelPixelScale: [10, 10, 0], ModelTiepoint: [0, 0, 0, 500_000, 5_290_000, 0],
        GTModelTypeGeoKey: 1, GTRasterTypeGeoKey: 1, GTCitationGeoKey: 'WGS 84 / UTM zone 32N', ProjectedCSTypeGeoKey: 32632, GDAL_NODATA: String(GEOTIFF_NODATA),
      }),
    );
    for (const x of [ours, reference]) {
      expect([x.image.getWidth(), x.image.getHeight()]).toEqual([3, 2]);
      expect(x.image.getOrigin()).toEqual([500_000, 5_290_000, 0]);
      expect(x.image.getResolution()).toEqual([10, -10, 0]);
      expect(x.image.getGDALNoData()).toBe(GEOTIFF_NODATA);
      expect(x.image.getSampleFormat()).toBe(3);
      expect(x.image.getBitsPerSample()).toBe(32);
    }
    expect(ours.image.getGeoKeys()).toEqual(reference.image.getGeoKeys());
    expect(Array.from(ours.band)).toEqual(Array.from(reference.band));
    expect(ours.band[2]).toBe(GEOTIFF_NODATA);
    expect(ours.band[5]).toBe(Math.fround(-6.123456));
  });

  it('carries a long description and a geographic system', async () => {
    const description = `${'Cautions. '.repeat(200)}end`;
    const { image } = await read(writeGeoTiff({ ...raster, description, geographic: true, epsgCode: 4326, citation: 'WGS 84', pixelX: 0.001, pixelY: 0.001, originX: 9.1, originY: 47.8 }));
    // TIFF ASCII ends in NUL; geotiff.js's deferred read keeps it.
    expect(String(await image.fileDirectory.loadValue('ImageDescription')).replace(/\0$/, '')).toBe(description);
    expect(image.getGeoKeys()).toEqual({ GTModelTypeGeoKey: 2, GTRasterTypeGeoKey: 1, GeogCitationGeoKey: 'WGS 84', GeographicTypeGeoKey: 4326 });
    expect(image.getOrigin()).toEqual([9.1, 47.8, 0]);
  });
});
