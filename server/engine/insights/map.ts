// The document map: each document as a point on two concept dimensions.
//
// Coordinates: the document's row r of V_k S_k (for an indexed document a_j this is
// a_j^T U_k, its projection onto the concept axes) divided by ||r|| over all k
// dimensions, at dimensions x and y. That is the cosine between the document and each
// axis: long and short documents land on the same scale, within [-1, 1], and the
// angle between two points reflects what cosine-based concept search compares.
// Under 'classic' scaling the stored rows are V_k rows and are multiplied by S_k first.

export interface MapCoordinates {
  x: Float32Array;
  y: Float32Array;
}

export function mapCoordinates(
  docMatrix: ArrayLike<number>,
  count: number,
  k: number,
  sigma: ArrayLike<number>,
  storedScaling: 'projection' | 'classic',
  dimX: number,
  dimY: number,
): MapCoordinates {
  if (!(dimX >= 0 && dimX < k && dimY >= 0 && dimY < k))
    throw new RangeError(`dimensions ${dimX + 1} and ${dimY + 1} must both be within 1..${k}`);
  const x = new Float32Array(count);
  const y = new Float32Array(count);
  const scale = Float64Array.from({ length: k }, (_, c) =>
    storedScaling === 'classic' ? sigma[c] : 1,
  );
  for (let j = 0; j < count; j++) {
    let s = 0;
    const o = j * k;
    for (let c = 0; c < k; c++) {
      const v = docMatrix[o + c] * scale[c];
      s += v * v;
    }
    if (!(s > 0)) continue; // a document without index terms sits at the origin
    const inv = 1 / Math.sqrt(s);
    x[j] = docMatrix[o + dimX] * scale[dimX] * inv;
    y[j] = docMatrix[o + dimY] * scale[dimY] * inv;
  }
  return { x, y };
}
