/**
 * PNG encoding of rendered charts (PNG specification, W3C 2003: signature, IHDR, IDAT, IEND; each
 * chunk is length, type, data, CRC-32 of type and data). resvg's own encoder runs on the calling
 * thread at its default compression; here the scanlines are deflated at level 1 on libuv's thread
 * pool, which for chart images (large flat areas) gives files of about the same size in a third
 * of the time, off the event loop.
 */
import { promisify } from 'node:util';
import zlib from 'node:zlib';

const deflate = promisify(zlib.deflate);
const SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

function chunk(type: string, data: Buffer): Buffer {
  const out = Buffer.alloc(12 + data.length);
  out.writeUInt32BE(data.length, 0);
  out.write(type, 4, 'latin1');
  data.copy(out, 8);
  out.writeUInt32BE(zlib.crc32(out.subarray(4, 8 + data.length)), 8 + data.length);
  return out;
}

/**
 * An 8-bit RGBA image (rows top to bottom, `width × height × 4` bytes) as PNG; `premultiplied`
 * when the colour channels are already multiplied by alpha (resvg's pixels are), since PNG stores
 * straight alpha. Every scanline uses filter 0 (none): with deflate at level 1, filtering costs
 * more time than it saves bytes on charts.
 */
export async function encodePng(width: number, height: number, rgba: Uint8Array, premultiplied = false): Promise<Buffer> {
  const stride = width * 4;
  if (!(Number.isInteger(width) && Number.isInteger(height) && width > 0 && height > 0) || rgba.length !== stride * height) {
    throw new Error(`encodePng: ${rgba.length} bytes do not make a ${width} × ${height} RGBA image`);
  }
  const raw = Buffer.alloc((stride + 1) * height);
  for (let y = 0; y < height; y++) raw.set(rgba.subarray(y * stride, (y + 1) * stride), y * (stride + 1) + 1);
  if (premultiplied && !isOpaque(rgba)) {
    for (let y = 0; y < height; y++) {
      const row = y * (stride + 1) + 1;
      for (let i = row; i < row + stride; i += 4) {
        const a = raw[i + 3]!;
        if (a === 255 || a === 0) continue;
        for (let c = 0; c < 3; c++) raw[i + c] = Math.min(255, Math.round((raw[i + c]! * 255) / a));
      }
    }
  }
  const header = Buffer.alloc(13);
  header.writeUInt32BE(width, 0);
  header.writeUInt32BE(height, 4);
  header[8] = 8; // bit depth
  header[9] = 6; // colour type: RGB with alpha
  // compression 0, filter method 0, no interlace: bytes 10–12 stay zero.
  const idat = await deflate(raw, { level: 1 });
  return Buffer.concat([SIGNATURE, chunk('IHDR', header), chunk('IDAT', idat), chunk('IEND', Buffer.alloc(0))]);
}

/**
 * Whether every pixel's alpha is 255 (a chart on its paper-white background), when premultiplied
 * and straight colour are the same bytes. Read four pixels' alphas at a time as 32-bit words.
 */
function isOpaque(rgba: Uint8Array): boolean {
  if (rgba.byteOffset % 4 !== 0) return rgba.every((v, i) => i % 4 !== 3 || v === 255);
  const words = new Uint32Array(rgba.buffer, rgba.byteOffset, rgba.length >> 2);
  // Byte 3 of each RGBA pixel is the top byte of its word on little-endian machines, the bottom on big-endian.
  const alpha = new Uint8Array(new Uint32Array([0xff000000]).buffer)[3] === 0xff ? 0xff000000 : 0x000000ff;
  for (let i = 0; i < words.length; i++) if ((words[i]! & alpha) >>> 0 !== alpha >>> 0) return false;
  return true;
}
