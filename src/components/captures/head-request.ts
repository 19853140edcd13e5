/**
 * Fetches the head of a capture with a Range request, so the quick look reads a couple of MiB
 * however large the capture is.
 */

/** Bytes of the first `samples` samples of a capture (whole samples only). */
export async function fetchHead(captureId: string, samples: number, bytesPerSample: number, signal?: AbortSignal): Promise<ArrayBuffer> {
  const length = samples * bytesPerSample;
  const response = await fetch(`/api/captures/${encodeURIComponent(captureId)}/data`, {
    headers: { range: `bytes=0-${length - 1}` },
    credentials: 'same-origin',
    signal,
  });
  if (response.status !== 206 && response.status !== 200) {
    throw new Error(`The capture's data could not be read: the server answered ${response.status} ${response.statusText}.`.replace(' .', '.'));
  }
  if (response.status === 206 || !response.body) {
    const buffer = await response.arrayBuffer();
    return buffer.byteLength > length ? buffer.slice(0, length) : buffer;
  }
  // A server that ignores Range sends everything: read only what the quick look needs, then stop.
  const reader = response.body.getReader();
  const out = new Uint8Array(length);
  let filled = 0;
  while (filled < length) {
    const { done, value } = await reader.read();
    if (done) break;
    const take = Math.min(value.length, length - filled);
    out.set(value.subarray(0, take), filled);
    filled += take;
  }
  await reader.cancel();
  return out.buffer.slice(0, filled);
}
