/**
 * Batch results for the journal, in a compact binary record: a small JSON header (generation, batch
 * number, start, count, the sparse reasons, the lengths) followed by the raw bytes of the values and
 * metrics (Float64, NaN kept as NaN), the status bytes and the warning counts. Encoding is a few
 * copies, so journaling every batch costs the main thread little; decoding gives back exactly the
 * arrays that were encoded.
 */
import type { BatchResult } from '../optimize/evaluate-batch.ts';

interface Header {
  generation: number;
  batch: number;
  start: number;
  count: number;
  reasons: Array<[number, string]>;
  values: number;
  metrics: number;
}

/** One journaled batch. */
export interface JournaledBatch {
  generation: number;
  batch: number;
  result: BatchResult;
}

const encoder = new TextEncoder();
const decoder = new TextDecoder();

export function encodeBatchRecord(generation: number, batch: number, result: BatchResult): Uint8Array {
  const header: Header = {
    generation,
    batch,
    start: result.start,
    count: result.count,
    reasons: result.reasons,
    values: result.values.length,
    metrics: result.metrics.length,
  };
  const headerBytes = encoder.encode(JSON.stringify(header));
  const headerPadded = 4 + Math.ceil(headerBytes.length / 8) * 8;
  const size = headerPadded + 8 * (header.values + header.metrics) + result.count + 4 * result.count;
  const bytes = new Uint8Array(size);
  new DataView(bytes.buffer).setUint32(0, headerBytes.length, true);
  bytes.set(headerBytes, 4);
  let offset = headerPadded;
  const put = (view: ArrayBufferView) => {
    bytes.set(new Uint8Array(view.buffer, view.byteOffset, view.byteLength), offset);
    offset += view.byteLength;
  };
  put(result.values);
  put(result.metrics);
  put(result.status);
  put(result.warningMasks);
  return bytes;
}

export function decodeBatchRecord(bytes: Uint8Array): JournaledBatch {
  const headerLength = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength).getUint32(0, true);
  const header = JSON.parse(decoder.decode(bytes.subarray(4, 4 + headerLength))) as Header;
  let offset = 4 + Math.ceil(headerLength / 8) * 8;
  // Copies into fresh, aligned buffers.
  const take = (byteLength: number): ArrayBuffer => {
    const copy = bytes.slice(offset, offset + byteLength).buffer;
    offset += byteLength;
    return copy;
  };
  const values = new Float64Array(take(8 * header.values));
  const metrics = new Float64Array(take(8 * header.metrics));
  const status = new Uint8Array(take(header.count));
  const warningMasks = new Uint32Array(take(4 * header.count));
  return {
    generation: header.generation,
    batch: header.batch,
    result: {
      start: header.start,
      count: header.count,
      values,
      metrics,
      status,
      reasons: header.reasons,
      warningMasks,
    },
  };
}
