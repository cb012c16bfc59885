/**
 * WAV files built byte by byte from the format specifications, independent of our own
 * writer, for the reader's tests.
 *
 * Sources: Microsoft/IBM "Multimedia Programming Interface and Data Specifications 1.0"
 * (1991), RIFF/WAVE fmt chunk (wFormatTag, nChannels, nSamplesPerSec, nAvgBytesPerSec,
 * nBlockAlign, wBitsPerSample); Microsoft Learn, "WAVEFORMATEXTENSIBLE structure
 * (mmreg.h)": cbSize = 22, Samples.wValidBitsPerSample, dwChannelMask, SubFormat GUID
 * (KSDATAFORMAT_SUBTYPE_PCM = 00000001-0000-0010-8000-00AA00389B71), and valid bits
 * left-justified in the wBitsPerSample container with the unused low bits zero.
 */

/** SubFormat GUID of KSDATAFORMAT_SUBTYPE_PCM as stored (Data1–3 little-endian). */
const SUBTYPE_PCM = [
  0x01, 0x00, 0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xaa, 0x00, 0x38, 0x9b, 0x71,
];
/** SPEAKER_FRONT_CENTER, the channel mask of a mono stream. */
const SPEAKER_FRONT_CENTER = 0x4;

/**
 * A mono RIFF/WAVE file: the RIFF header, a fmt chunk of `fmtSize` bytes (its 16 common bytes
 * here, any further ones written by `fmtRest` from offset 36) and a data chunk of `dataSize`
 * bytes, padded to an even length, that `writeData` fills from offset `start`.
 */
function monoWave(o: {
  formatTag: number;
  sampleRateHz: number;
  containerBits: number;
  fmtSize: number;
  dataSize: number;
  fmtRest?: (v: DataView, bytes: Uint8Array) => void;
  writeData: (v: DataView, bytes: Uint8Array, start: number) => void;
}): Uint8Array {
  const width = o.containerBits / 8;
  const total = 12 + 8 + o.fmtSize + 8 + o.dataSize + (o.dataSize % 2);
  const bytes = new Uint8Array(total);
  const v = new DataView(bytes.buffer);
  const ascii = (at: number, s: string) => {
    for (let i = 0; i < 4; i++) bytes[at + i] = s.charCodeAt(i);
  };
  ascii(0, 'RIFF');
  v.setUint32(4, total - 8, true);
  ascii(8, 'WAVE');
  ascii(12, 'fmt ');
  v.setUint32(16, o.fmtSize, true);
  v.setUint16(20, o.formatTag, true); // wFormatTag
  v.setUint16(22, 1, true); // nChannels
  v.setUint32(24, o.sampleRateHz, true); // nSamplesPerSec
  v.setUint32(28, o.sampleRateHz * width, true); // nAvgBytesPerSec
  v.setUint16(32, width, true); // nBlockAlign
  v.setUint16(34, o.containerBits, true); // wBitsPerSample (the container)
  o.fmtRest?.(v, bytes);
  const at = 20 + o.fmtSize;
  ascii(at, 'data');
  v.setUint32(at + 4, o.dataSize, true);
  o.writeData(v, bytes, at + 8);
  return bytes;
}

/**
 * Mono integer PCM: `codes` of a `validBits` converter stored in `containerBits`
 * containers. `extensible` writes WAVE_FORMAT_EXTENSIBLE (0xFFFE, 40-byte fmt), otherwise
 * WAVE_FORMAT_PCM (1, 16-byte fmt, where valid bits must equal the container).
 */
export function pcmWavBytes(
  codes: ArrayLike<number>,
  sampleRateHz: number,
  containerBits: 16 | 24 | 32,
  validBits: number = containerBits,
  extensible = validBits !== containerBits,
): Uint8Array {
  const width = containerBits / 8;
  const shift = 2 ** (containerBits - validBits);
  return monoWave({
    formatTag: extensible ? 0xfffe : 1,
    sampleRateHz,
    containerBits,
    fmtSize: extensible ? 40 : 16,
    dataSize: codes.length * width,
    fmtRest: extensible
      ? (v, bytes) => {
          v.setUint16(36, 22, true); // cbSize
          v.setUint16(38, validBits, true); // Samples.wValidBitsPerSample
          v.setUint32(40, SPEAKER_FRONT_CENTER, true); // dwChannelMask
          bytes.set(SUBTYPE_PCM, 44); // SubFormat
        }
      : undefined,
    writeData: (_, bytes, start) => {
      for (let i = 0; i < codes.length; i++) {
        // left-justified: the code times 2^(container − valid), two's complement, little-endian
        let x = codes[i]! * shift;
        if (x < 0) x += 2 ** containerBits;
        for (let b = 0; b < width; b++) {
          bytes[start + i * width + b] = x % 256;
          x = Math.floor(x / 256);
        }
      }
    },
  });
}

/** Mono IEEE float 32-bit (WAVE_FORMAT_IEEE_FLOAT = 3, 18-byte fmt with cbSize = 0). */
export function floatWavBytes(values: ArrayLike<number>, sampleRateHz: number): Uint8Array {
  return monoWave({
    formatTag: 3, // WAVE_FORMAT_IEEE_FLOAT
    sampleRateHz,
    containerBits: 32,
    fmtSize: 18,
    dataSize: values.length * 4,
    fmtRest: (v) => v.setUint16(36, 0, true), // cbSize
    writeData: (v, _, start) => {
      for (let i = 0; i < values.length; i++) v.setFloat32(start + i * 4, values[i]!, true);
    },
  });
}
