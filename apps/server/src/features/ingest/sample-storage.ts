/**
 * How raw samples are kept in `snapshots.samples` (`samples_codec`). A gateway-sized capture
 * is stored as sent; a larger one (an upload from a portable instrument) as raw deflate,
 * compressed in the thread pool.
 *
 * Why not deflate every capture: on the ingest path, deflating a 4,096-sample capture cost
 * about 0.3 ms of the server's CPU per post (1,001 → 1,372 and 956 → 1,264 posts/s in
 * interleaved runs of tests/bench/ingest-bench.ts with and without it), and saved little:
 * on the demo history a capture's raw samples shrink from 24.6 to 20.0 kB (int24) while its
 * analysis kept about 23 kB of spectra and summaries (since then its spectra are
 * compacted: tests/bench/storage-bench.ts), and raw samples expire after
 * RETENTION_DAYS while analyses stay.
 */
import { promisify } from 'node:util';
import { constants as zlibConstants, deflateRaw, inflateRaw, inflateRawSync } from 'node:zlib';

export type SamplesCodec = 'deflate-raw' | 'none';

/** Captures up to this size are stored as sent. */
export const STORE_AS_SENT_BYTES = 64 * 1024;

const deflate = promisify(deflateRaw);
const inflate = promisify(inflateRaw);
/**
 * Run-length strategy at level 1 (still raw deflate, read back by plain inflateRaw):
 * vibration counts hold almost no repeated strings, so the Huffman coding is where the
 * saving is; memLevel 9 codes a capture in fewer blocks (less CPU, same size).
 */
const DEFLATE_OPTIONS = { level: 1, strategy: zlibConstants.Z_RLE, memLevel: 9 };

/** The stored form of sample bytes. */
export async function samplesForStorage(
  bytes: Buffer,
): Promise<{ samples: Buffer; samplesCodec: SamplesCodec }> {
  return bytes.length <= STORE_AS_SENT_BYTES
    ? { samples: bytes, samplesCodec: 'none' }
    : { samples: await deflate(bytes, DEFLATE_OPTIONS), samplesCodec: 'deflate-raw' };
}

/** The sample bytes of a stored row, on this thread (the worker's analyses). */
export function storedSampleBytes(samples: Buffer, codec: SamplesCodec): Buffer {
  return codec === 'none' ? samples : inflateRawSync(samples);
}

/** The sample bytes of a stored row, inflated in the thread pool (downloads, views). */
export async function storedSampleBytesAsync(
  samples: Buffer,
  codec: SamplesCodec,
): Promise<Buffer> {
  return codec === 'none' ? samples : inflate(samples);
}
