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
  const fmtSize = extensible ? 40 : 16;
  const dataSize = codes.length * width;
  const total = 12 + 8 + fmtSize + 8 + dataSize + (dataSize % 2);
  const bytes = new Uint8Array(total);
  const v = new DataView(bytes.buffer);
  const ascii = (o: number, s: string) => {
    for (let i = 0; i < 4; i++) bytes[o + i] = s.charCodeAt(i);
  };
  ascii(0, 'RIFF');
  v.setUint32(4, total - 8, true);
  ascii(8, 'WAVE');
  ascii(12, 'fmt ');
  v.setUint32(16, fmtSize, true);
  v.setUint16(20, extensible ? 0xfffe : 1, true); // wFormatTag
  v.setUint16(22, 1, true); // nChannels
  v.setUint32(24, sampleRateHz, true); // nSamplesPerSec
  v.setUint32(28, sampleRateHz * width, true); // nAvgBytesPerSec
  v.setUint16(32, width, true); // nBlockAlign
  v.setUint16(34, containerBits, true); // wBitsPerSample (the container)
  let o = 36;
  if (extensible) {
    v.setUint16(36, 22, true); // cbSize
    v.setUint16(38, validBits, true); // Samples.wValidBitsPerSample
    v.setUint32(40, SPEAKER_FRONT_CENTER, true); // dwChannelMask
    bytes.set(SUBTYPE_PCM, 44); // SubFormat
    o = 60;
  }
  ascii(o, 'data');
  v.setUint32(o + 4, dataSize, true);
  const shift = 2 ** (containerBits - validBits);
  for (let i = 0; i < codes.length; i++) {
    // left-justified: the code times 2^(container − valid), two's complement, little-endian
    let x = codes[i]! * shift;
    if (x < 0) x += 2 ** containerBits;
    for (let b = 0; b < width; b++) {
      bytes[o + 8 + i * width + b] = x % 256;
      x = Math.floor(x / 256);
    }
  }
  return bytes;
}

/** Mono IEEE float 32-bit (WAVE_FORMAT_IEEE_FLOAT = 3, 18-byte fmt with cbSize = 0). */
export function floatWavBytes(values: ArrayLike<number>, sampleRateHz: number): Uint8Array {
  const dataSize = values.length * 4;
  const total = 12 + 8 + 18 + 8 + dataSize;
  const bytes = new Uint8Array(total);
  const v = new DataView(bytes.buffer);
  const ascii = (o: number, s: string) => {
    for (let i = 0; i < 4; i++) bytes[o + i] = s.charCodeAt(i);
  };
  ascii(0, 'RIFF');
  v.setUint32(4, total - 8, true);
  ascii(8, 'WAVE');
  ascii(12, 'fmt ');
  v.setUint32(16, 18, true);
  v.setUint16(20, 3, true); // WAVE_FORMAT_IEEE_FLOAT
  v.setUint16(22, 1, true);
  v.setUint32(24, sampleRateHz, true);
  v.setUint32(28, sampleRateHz * 4, true);
  v.setUint16(32, 4, true);
  v.setUint16(34, 32, true);
  v.setUint16(36, 0, true); // cbSize
  ascii(38, 'data');
  v.setUint32(42, dataSize, true);
  for (let i = 0; i < values.length; i++) v.setFloat32(46 + i * 4, values[i]!, true);
  return bytes;
}
