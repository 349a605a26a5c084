import zlib from 'node:zlib';
import yauzl from 'yauzl';

/**
 * A workbook (.xlsx) is a zip archive, and a small archive can unpack to gigabytes (a "zip bomb"), or carry large
 * media the model import never reads. Before the workbook library sees an upload, its central directory is read
 * (nothing unpacked): the entry count, the unpacked size of each entry and in all, and the compression ratio are
 * checked; only the parts a model import reads (sheets, shared strings, styles, the workbook and its relationships,
 * content types, document properties, theme) are unpacked, counting the bytes as they come (an entry that unpacks
 * to more than it declared is stopped), and repacked without the rest (images, drawings, embedded objects…).
 */

export const ZIP_LIMITS = {
  /** Entries in the archive (kept or not). */
  maxEntries: 2000,
  /** Unpacked size of one kept entry, bytes. */
  maxEntryBytes: 25 * 1024 * 1024,
  /** Unpacked size of all kept entries, bytes. */
  maxTotalBytes: 50 * 1024 * 1024,
  /** Unpacked size of all entries, kept or not, as the archive declares it, bytes. */
  maxDeclaredBytes: 500 * 1024 * 1024,
  /** Highest unpacked/packed ratio of an entry above 1 MB (common practice, no source: sheet XML packs about 10:1). */
  maxRatio: 200,
} as const;

/** An archive refused before it was unpacked: `status` 413 (too large unpacked) or 422 (malformed or suspicious). */
export class UnsafeArchiveError extends Error {
  constructor(
    readonly status: 413 | 422,
    message: string,
  ) {
    super(message);
  }
}

/** The parts of a workbook a model import reads; everything else is left packed and dropped. */
export function isWorkbookPartKept(name: string): boolean {
  return (
    /^xl\/worksheets\/[^/]+\.xml$/i.test(name) ||
    /^xl\/worksheets\/_rels\/[^/]+\.xml\.rels$/i.test(name) ||
    /^xl\/(sharedStrings|styles|workbook)\.xml$/i.test(name) ||
    /^xl\/_rels\/workbook\.xml\.rels$/i.test(name) ||
    /^xl\/theme\/[^/]+\.xml$/i.test(name) ||
    /^\[Content_Types\]\.xml$/i.test(name) ||
    /^_rels\/\.rels$/i.test(name) ||
    /^docProps\/[^/]+\.xml$/i.test(name)
  );
}

const mb = (bytes: number) => `${Math.round(bytes / (1024 * 1024))} MB`;

function openZip(buffer: Buffer): Promise<yauzl.ZipFile> {
  return new Promise((resolve, reject) =>
    yauzl.fromBuffer(buffer, { lazyEntries: true, validateEntrySizes: true, strictFileNames: false }, (err, zip) =>
      err || !zip ? reject(err ?? new Error('no archive')) : resolve(zip),
    ),
  );
}

/**
 * A kept part without its references to dropped parts: a sheet loses its drawing, comments, table, control and
 * embedded-object elements, a sheet's relationships keep only hyperlinks (the workbook reader would otherwise look
 * for the dropped parts and fail).
 */
export function withoutDroppedReferences(name: string, data: Buffer): Buffer {
  if (/^xl\/worksheets\/_rels\//i.test(name)) {
    const xml = data.toString('utf8');
    return Buffer.from(
      xml.replace(/<Relationship\b[^>]*\/>/g, (rel) => (/Type="[^"]*\/hyperlink"/.test(rel) ? rel : '')),
      'utf8',
    );
  }
  if (/^xl\/worksheets\/[^/]+\.xml$/i.test(name)) {
    const xml = data.toString('utf8');
    return Buffer.from(
      xml
        .replace(/<((?:\w+:)?(?:drawing|legacyDrawing|legacyDrawingHF|picture))\b[^>]*\/>/g, '')
        .replace(/<((?:\w+:)?(?:tableParts|oleObjects|controls))\b[^>]*\/>/g, '')
        .replace(/<((?:\w+:)?(?:tableParts|oleObjects|controls))\b[^>]*>[\s\S]*?<\/\1>/g, ''),
      'utf8',
    );
  }
  return data;
}

/** Unpacks one entry, stopping as soon as it passes `limit` bytes. */
function readEntry(zip: yauzl.ZipFile, entry: yauzl.Entry, limit: number): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    zip.openReadStream(entry, (err, stream) => {
      if (err || !stream) return reject(err ?? new Error('unreadable entry'));
      const chunks: Buffer[] = [];
      let size = 0;
      stream.on('data', (chunk: Buffer) => {
        size += chunk.length;
        if (size > limit) {
          stream.destroy();
          reject(
            new UnsafeArchiveError(
              413,
              `The workbook part "${entry.fileName}" unpacks to more than ${mb(limit)}; upload a smaller workbook`,
            ),
          );
          return;
        }
        chunks.push(chunk);
      });
      stream.on('error', reject);
      stream.on('end', () => resolve(Buffer.concat(chunks)));
    });
  });
}

/**
 * Checks a workbook archive and returns it repacked with only the parts a model import reads.
 * Throws UnsafeArchiveError (413 or 422) with a message for the user; a file that is not a zip at all is returned
 * unchanged (the workbook reader then reports it as unreadable).
 */
export async function guardWorkbookArchive(buffer: Buffer): Promise<Buffer> {
  let zip: yauzl.ZipFile;
  try {
    zip = await openZip(buffer);
  } catch {
    return buffer;
  }
  try {
    if (zip.entryCount > ZIP_LIMITS.maxEntries) {
      throw new UnsafeArchiveError(
        422,
        `The workbook archive has ${zip.entryCount} parts (at most ${ZIP_LIMITS.maxEntries}); it is not a model workbook`,
      );
    }
    const kept: { name: string; data: Buffer }[] = [];
    let declared = 0;
    let unpacked = 0;
    await new Promise<void>((resolve, reject) => {
      zip.on('error', reject);
      zip.on('end', () => resolve());
      zip.on('entry', (entry: yauzl.Entry) => {
        void (async () => {
          const name = entry.fileName;
          const size = entry.uncompressedSize;
          declared += size;
          if (declared > ZIP_LIMITS.maxDeclaredBytes) {
            throw new UnsafeArchiveError(
              413,
              `The workbook unpacks to more than ${mb(ZIP_LIMITS.maxDeclaredBytes)}; remove images or other embedded files and upload it again`,
            );
          }
          if (size > 1024 * 1024 && size / Math.max(1, entry.compressedSize) > ZIP_LIMITS.maxRatio) {
            throw new UnsafeArchiveError(
              422,
              `The workbook part "${name}" is compressed ${Math.round(size / Math.max(1, entry.compressedSize))}:1, ` +
                'far beyond any real workbook; it was not unpacked',
            );
          }
          if (!name.endsWith('/') && isWorkbookPartKept(name)) {
            if (size > ZIP_LIMITS.maxEntryBytes) {
              throw new UnsafeArchiveError(
                413,
                `The workbook part "${name}" unpacks to ${mb(size)} (at most ${mb(ZIP_LIMITS.maxEntryBytes)})`,
              );
            }
            if (unpacked + size > ZIP_LIMITS.maxTotalBytes) {
              throw new UnsafeArchiveError(
                413,
                `The workbook's sheets unpack to more than ${mb(ZIP_LIMITS.maxTotalBytes)}; split the model or remove unused sheets`,
              );
            }
            const limit = Math.min(ZIP_LIMITS.maxEntryBytes, ZIP_LIMITS.maxTotalBytes - unpacked);
            const data = await readEntry(zip, entry, limit);
            unpacked += data.length;
            kept.push({ name, data: withoutDroppedReferences(name, data) });
          }
          zip.readEntry();
        })().catch(reject);
      });
      zip.readEntry();
    });
    return writeZip(kept);
  } catch (e) {
    if (e instanceof UnsafeArchiveError) throw e;
    throw new UnsafeArchiveError(422, 'The workbook archive is damaged and cannot be read');
  } finally {
    zip.close();
  }
}

/** A zip archive of the given entries, deflated (local headers, data, central directory; no zip64). */
export function writeZip(entries: { name: string; data: Buffer }[]): Buffer {
  const parts: Buffer[] = [];
  const central: Buffer[] = [];
  let offset = 0;
  for (const { name, data } of entries) {
    const nameBytes = Buffer.from(name, 'utf8');
    const packed = zlib.deflateRawSync(data);
    const crc = zlib.crc32(data);
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4); // version needed
    local.writeUInt16LE(0x0800, 6); // UTF-8 names
    local.writeUInt16LE(8, 8); // deflate
    local.writeUInt32LE(0, 10); // time, date
    local.writeUInt32LE(crc >>> 0, 14);
    local.writeUInt32LE(packed.length, 18);
    local.writeUInt32LE(data.length, 22);
    local.writeUInt16LE(nameBytes.length, 26);
    local.writeUInt16LE(0, 28);
    parts.push(local, nameBytes, packed);
    const dir = Buffer.alloc(46);
    dir.writeUInt32LE(0x02014b50, 0);
    dir.writeUInt16LE(20, 4); // version made by
    dir.writeUInt16LE(20, 6);
    dir.writeUInt16LE(0x0800, 8);
    dir.writeUInt16LE(8, 10);
    dir.writeUInt32LE(0, 12);
    dir.writeUInt32LE(crc >>> 0, 16);
    dir.writeUInt32LE(packed.length, 20);
    dir.writeUInt32LE(data.length, 24);
    dir.writeUInt16LE(nameBytes.length, 28);
    // extra, comment, disk, internal attributes: 0; external attributes: 0
    dir.writeUInt32LE(offset, 42);
    central.push(dir, nameBytes);
    offset += local.length + nameBytes.length + packed.length;
  }
  const centralSize = central.reduce((n, b) => n + b.length, 0);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(entries.length, 8);
  end.writeUInt16LE(entries.length, 10);
  end.writeUInt32LE(centralSize, 12);
  end.writeUInt32LE(offset, 16);
  return Buffer.concat([...parts, ...central, end]);
}
