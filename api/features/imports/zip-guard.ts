/**
 * The defence of the workbook reader against compressed bombs. An .xlsx file is a ZIP archive;
 * a few megabytes of it can inflate to gigabytes. Before any XML is parsed:
 *
 * 1. the central directory is read (yauzl) and every entry's declared uncompressed size, the
 *    total of them and each entry's compression ratio are held against limits, so the common
 *    bomb is refused without inflating a byte;
 * 2. every entry is then inflated once as a stream and its bytes are counted (and discarded),
 *    so an archive that lies about its sizes is stopped when the count passes the limit, not
 *    after the memory is gone. yauzl also refuses an entry longer than it declared.
 *
 * The reader itself runs in a worker thread with a memory cap (see parse-pool.ts), the last line.
 */
import yauzl from 'yauzl';
import { PayloadTooLargeError } from '../../lib/errors';
import { UnreadableFileError } from './errors';

export interface ZipLimits {
  /** Largest declared (and actual) uncompressed size of one entry, in bytes. */
  maxEntryBytes: number;
  /** Largest sum of uncompressed sizes over the archive, in bytes. */
  maxTotalBytes: number;
  /** Highest uncompressed / compressed ratio accepted for an entry larger than `ratioFloorBytes`. */
  maxRatio: number;
  /** Entries smaller than this may compress as well as they like (tiny XML parts compress 100× and more). */
  ratioFloorBytes: number;
  /** Most entries in the archive. */
  maxEntries: number;
}

/**
 * A 100 000-row screen saved by a spreadsheet program is about 15–40 MB of sheet XML and
 * compresses 8–20× [M]; the limits leave a wide margin above that and far below a bomb.
 */
export const ZIP_LIMITS: ZipLimits = {
  maxEntryBytes: 160 * 1024 * 1024,
  maxTotalBytes: 256 * 1024 * 1024,
  maxRatio: 150,
  ratioFloorBytes: 1024 * 1024,
  maxEntries: 2000,
};

export interface ZipSummary {
  entries: number;
  /** Sum of the declared uncompressed sizes. */
  declaredBytes: number;
  /** Bytes actually produced by inflating every entry. */
  inflatedBytes: number;
}

const mb = (n: number) => `${(n / (1024 * 1024)).toFixed(0)} MB`;

function notAWorkbook(name: string): UnreadableFileError {
  return new UnreadableFileError(
    `${name} is a ZIP archive but not a readable Excel workbook (it may be another kind of document renamed .xlsx, or damaged).`,
  );
}

function bomb(name: string, why: string): PayloadTooLargeError {
  return new PayloadTooLargeError(
    `${name} would expand to ${why} when unpacked, more than a worksheet of measurements needs; it was not opened. Save the sheet again, or as CSV.`,
  );
}

/** Read the central directory and refuse the archive when its declared sizes are beyond `limits`. */
export async function checkZipDirectory(
  name: string,
  buffer: Buffer,
  limits: ZipLimits = ZIP_LIMITS,
): Promise<{ zip: yauzl.ZipFile; entries: yauzl.Entry[]; declaredBytes: number }> {
  let zip: yauzl.ZipFile;
  try {
    zip = await yauzl.fromBufferPromise(buffer, {
      lazyEntries: true,
      validateEntrySizes: true,
      strictFileNames: false,
      decodeStrings: true,
    });
  } catch {
    throw notAWorkbook(name);
  }
  if (zip.entryCount > limits.maxEntries) {
    zip.close();
    throw new PayloadTooLargeError(
      `${name} holds ${zip.entryCount} parts; a workbook of measurements has a few dozen (at most ${limits.maxEntries} are opened).`,
    );
  }
  const entries: yauzl.Entry[] = [];
  let declaredBytes = 0;
  try {
    await new Promise<void>((resolve, reject) => {
      zip.on('error', () => reject(notAWorkbook(name)));
      zip.on('end', () => resolve());
      zip.on('entry', (entry: yauzl.Entry) => {
        const size = entry.uncompressedSize;
        declaredBytes += size;
        if (size > limits.maxEntryBytes) return reject(bomb(name, `${mb(size)} in one part (${entry.fileName})`));
        if (declaredBytes > limits.maxTotalBytes) return reject(bomb(name, `more than ${mb(limits.maxTotalBytes)}`));
        if (size > limits.ratioFloorBytes && size > limits.maxRatio * Math.max(1, entry.compressedSize)) {
          return reject(bomb(name, `${Math.round(size / Math.max(1, entry.compressedSize))} times its packed size in ${entry.fileName}`));
        }
        entries.push(entry);
        zip.readEntry();
      });
      zip.readEntry();
    });
  } catch (err) {
    zip.close();
    throw err;
  }
  return { zip, entries, declaredBytes };
}

/**
 * Check the directory, then inflate every entry once, counting bytes; stop at the first part that
 * produces more than its limit or when the total passes the archive limit. Resolves with the
 * sizes seen; nothing inflated is kept.
 */
export async function inspectZip(
  name: string,
  buffer: Buffer,
  limits: ZipLimits = ZIP_LIMITS,
  onProgress?: (inflatedBytes: number) => void,
): Promise<ZipSummary> {
  const { zip, entries, declaredBytes } = await checkZipDirectory(name, buffer, limits);
  let inflatedBytes = 0;
  try {
    for (const entry of entries) {
      if (entry.fileName.endsWith('/')) continue;
      const stream = await new Promise<NodeJS.ReadableStream>((resolve, reject) =>
        zip.openReadStream(entry, (err, s) => (err || !s ? reject(notAWorkbook(name)) : resolve(s))),
      );
      await new Promise<void>((resolve, reject) => {
        let entryBytes = 0;
        const stop = (err: Error) => {
          (stream as NodeJS.ReadableStream & { destroy?: () => void }).destroy?.();
          reject(err);
        };
        stream.on('data', (chunk: Buffer) => {
          entryBytes += chunk.length;
          inflatedBytes += chunk.length;
          if (entryBytes > limits.maxEntryBytes)
            return stop(bomb(name, `more than ${mb(limits.maxEntryBytes)} in one part (${entry.fileName})`));
          if (inflatedBytes > limits.maxTotalBytes) return stop(bomb(name, `more than ${mb(limits.maxTotalBytes)}`));
          onProgress?.(inflatedBytes);
        });
        // yauzl raises an error when an entry inflates to more (or less) than its header declared.
        stream.on('error', (err: Error) =>
          reject(/too many bytes/i.test(err.message) ? bomb(name, 'more than it declares') : notAWorkbook(name)),
        );
        stream.on('end', () => resolve());
      });
    }
  } finally {
    zip.close();
  }
  return { entries: entries.length, declaredBytes, inflatedBytes };
}
