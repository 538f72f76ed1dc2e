/**
 * Hand-built .xlsx archives for the upload-hardening tests: a ZIP writer small enough to lie
 * about sizes on purpose, and the workbooks built with it (a ratio bomb, a bomb whose directory
 * understates its size, a million-row sheet, a sheet with a NUL character).
 */
import { crc32, deflateRawSync } from 'node:zlib';

export interface ZipPart {
  name: string;
  data: Buffer;
  /** Uncompressed size written into the headers instead of the true one (to build a lying archive). */
  declaredSize?: number;
}

/** A ZIP archive of deflated parts with local headers, a central directory and its end record. */
export function buildZip(parts: ZipPart[]): Buffer {
  const locals: Buffer[] = [];
  const centrals: Buffer[] = [];
  let offset = 0;
  for (const part of parts) {
    const name = Buffer.from(part.name, 'utf8');
    const packed = deflateRawSync(part.data, { level: part.data.length > 1024 * 1024 ? 1 : 9 });
    const crc = crc32(part.data);
    const size = part.declaredSize ?? part.data.length;
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(0x0800, 6); // UTF-8 names
    local.writeUInt16LE(8, 8); // deflate
    local.writeUInt32LE(crc, 14);
    local.writeUInt32LE(packed.length, 18);
    local.writeUInt32LE(size, 22);
    local.writeUInt16LE(name.length, 26);
    const central = Buffer.alloc(46);
    central.writeUInt32LE(0x02014b50, 0);
    central.writeUInt16LE(20, 4);
    central.writeUInt16LE(20, 6);
    central.writeUInt16LE(0x0800, 8);
    central.writeUInt16LE(8, 10);
    central.writeUInt32LE(crc, 16);
    central.writeUInt32LE(packed.length, 20);
    central.writeUInt32LE(size, 24);
    central.writeUInt16LE(name.length, 28);
    central.writeUInt32LE(offset, 42);
    locals.push(local, name, packed);
    centrals.push(central, name);
    offset += local.length + name.length + packed.length;
  }
  const directory = Buffer.concat(centrals);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(parts.length, 8);
  end.writeUInt16LE(parts.length, 10);
  end.writeUInt32LE(directory.length, 12);
  end.writeUInt32LE(offset, 16);
  return Buffer.concat([...locals, directory, end]);
}

const xml = (s: string) => Buffer.from(`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n${s}`, 'utf8');
const NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const RELS = 'http://schemas.openxmlformats.org/package/2006/relationships';
const DOC_RELS = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';

/** The fixed parts of a one-sheet workbook, in the order spreadsheet programs write them. */
function workbookParts(sheet: Buffer, sheetDeclaredSize?: number): ZipPart[] {
  return [
    {
      name: '[Content_Types].xml',
      data: xml(
        `<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/><Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/><Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/><Override PartName="/xl/sharedStrings.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"/></Types>`,
      ),
    },
    {
      name: '_rels/.rels',
      data: xml(
        `<Relationships xmlns="${RELS}"><Relationship Id="rId1" Type="${DOC_RELS}/officeDocument" Target="xl/workbook.xml"/></Relationships>`,
      ),
    },
    {
      name: 'xl/workbook.xml',
      data: xml(`<workbook xmlns="${NS}" xmlns:r="${DOC_RELS}"><sheets><sheet name="Screen" sheetId="1" r:id="rId1"/></sheets></workbook>`),
    },
    {
      name: 'xl/_rels/workbook.xml.rels',
      data: xml(
        `<Relationships xmlns="${RELS}"><Relationship Id="rId1" Type="${DOC_RELS}/worksheet" Target="worksheets/sheet1.xml"/><Relationship Id="rId2" Type="${DOC_RELS}/sharedStrings" Target="sharedStrings.xml"/></Relationships>`,
      ),
    },
    { name: 'xl/sharedStrings.xml', data: xml(`<sst xmlns="${NS}" count="0" uniqueCount="0"></sst>`) },
    { name: 'xl/worksheets/sheet1.xml', data: sheet, declaredSize: sheetDeclaredSize },
  ];
}

const inline = (ref: string, text: string) => `<c r="${ref}" t="inlineStr"><is><t>${text}</t></is></c>`;
const HEADER_ROW = `<row r="1">${inline('A1', 'T (°C)')}${inline('B1', 'ee (%)')}</row>`;

/** A worksheet of `rows` measurement rows under a header: the row bomb when `rows` is large. */
export function manyRowsWorkbook(rows: number): Buffer {
  const chunks: string[] = [`<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<worksheet xmlns="${NS}"><sheetData>`, HEADER_ROW];
  for (let r = 2; r <= rows + 1; r++)
    chunks.push(`<row r="${r}"><c r="A${r}"><v>${(r % 80) - 40}</v></c><c r="B${r}"><v>9${r % 10}.5</v></c></row>`);
  chunks.push('</sheetData></worksheet>');
  return buildZip(workbookParts(Buffer.from(chunks.join(''), 'utf8')));
}

/**
 * A worksheet padded with `inflatedMb` megabytes of whitespace between two rows: a few kilobytes
 * packed, and honest about its size, so only the compression ratio gives it away.
 */
export function ratioBombWorkbook(inflatedMb: number): Buffer {
  const head = Buffer.from(
    `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<worksheet xmlns="${NS}"><sheetData>${HEADER_ROW}`,
    'utf8',
  );
  const tail = Buffer.from(`<row r="2"><c r="A2"><v>25</v></c><c r="B2"><v>96.5</v></c></row></sheetData></worksheet>`, 'utf8');
  return buildZip(workbookParts(Buffer.concat([head, Buffer.alloc(inflatedMb * 1024 * 1024, 0x20), tail])));
}

/** Like the ratio bomb, but its headers declare a tiny sheet, so the directory check passes and only counting catches it. */
export function lyingBombWorkbook(inflatedMb: number): Buffer {
  const head = Buffer.from(
    `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<worksheet xmlns="${NS}"><sheetData>${HEADER_ROW}`,
    'utf8',
  );
  const tail = Buffer.from(`</sheetData></worksheet>`, 'utf8');
  return buildZip(workbookParts(Buffer.concat([head, Buffer.alloc(inflatedMb * 1024 * 1024, 0x20), tail]), 4096));
}

/** A small valid workbook with a NUL character inside a text cell (row 3, notes column). */
export function nulWorkbook(): Buffer {
  const sheet = `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<worksheet xmlns="${NS}"><sheetData><row r="1">${inline('A1', 'T (°C)')}${inline('B1', 'ee (%)')}${inline('C1', 'notes')}</row><row r="2"><c r="A2"><v>25</v></c><c r="B2"><v>90.5</v></c>${inline('C2', 'ok')}</row><row r="3"><c r="A3"><v>0</v></c><c r="B3"><v>94.1</v></c>${inline('C3', 'bad\u0000cell')}</row></sheetData></worksheet>`;
  return buildZip(workbookParts(Buffer.from(sheet, 'utf8')));
}
