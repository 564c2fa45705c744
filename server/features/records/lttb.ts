/**
 * Largest-Triangle-Three-Buckets (Steinarsson 2013, "Downsampling Time Series for Visual
 * Representation", MSc thesis, University of Iceland, ch. 4) over typed arrays: the indexes of
 * the `threshold` points kept from x[0..n), y[0..n). The first and last points are always kept;
 * each bucket between them keeps the point that makes the largest triangle with the point kept
 * before it and the mean of the next bucket.
 *
 * Buckets and ties follow the npm package "downsample" (its LTTB), so both keep the same points;
 * a test holds them to that. This version reads typed arrays in place and allocates only the
 * result, which matters for a million readings.
 */
export function lttbIndexes(x: ArrayLike<number>, y: ArrayLike<number>, n: number, threshold: number): Int32Array {
  if (threshold >= n || n <= 2) return Int32Array.from({ length: n }, (_, i) => i);
  if (threshold < 3) throw new RangeError(`LTTB needs a threshold of at least 3 (got ${threshold})`);
  const out = new Int32Array(threshold);
  const innerCount = n - 2;
  const buckets = threshold - 2;
  const size = innerCount / buckets;
  // Bucket b (0-based among the inner ones) holds points 1 + floor(b·size) … 1 + floor((b+1)·size) − 1.
  const bucketStart = (b: number) => 1 + Math.floor(b * size);
  let kept = 0;
  out[0] = 0;
  let ax = x[0];
  let ay = y[0];
  for (let b = 0; b < buckets; b++) {
    const from = bucketStart(b);
    const to = bucketStart(b + 1);
    // The next bucket's mean; after the last inner bucket, the last point alone.
    let cx = 0;
    let cy = 0;
    if (b === buckets - 1) {
      cx = x[n - 1];
      cy = y[n - 1];
    } else {
      const nextFrom = to;
      const nextTo = bucketStart(b + 2);
      for (let j = nextFrom; j < nextTo; j++) {
        cx += x[j];
        cy += y[j];
      }
      const m = nextTo - nextFrom;
      cx /= m;
      cy /= m;
    }
    let maxArea = -1;
    let chosen = from;
    for (let j = from; j < to; j++) {
      const area = Math.abs((ax - cx) * (y[j] - ay) - (ax - x[j]) * (cy - ay)) / 2;
      if (area > maxArea) {
        maxArea = area;
        chosen = j;
      }
    }
    out[++kept] = chosen;
    ax = x[chosen];
    ay = y[chosen];
  }
  out[threshold - 1] = n - 1;
  return out;
}
