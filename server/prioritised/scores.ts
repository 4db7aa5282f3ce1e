// A model's scores as stored: Int32 document ids and Float32 scores, little-endian
// typed-array bytes (the platform order, as the index BLOBs are stored).

export function encodeScores(ids: Int32Array, scores: Float32Array) {
  return {
    docIds: new Uint8Array(ids.buffer.slice(ids.byteOffset, ids.byteOffset + ids.byteLength)),
    scores: new Uint8Array(
      scores.buffer.slice(scores.byteOffset, scores.byteOffset + scores.byteLength),
    ),
  };
}

export function decodeScores(docIds: Uint8Array, scores: Uint8Array) {
  const ids = new Int32Array(docIds.byteLength / 4);
  new Uint8Array(ids.buffer).set(docIds);
  const values = new Float32Array(scores.byteLength / 4);
  new Uint8Array(values.buffer).set(scores);
  return { ids, scores: values };
}
