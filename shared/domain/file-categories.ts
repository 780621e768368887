// Groups a recovered-file manifest into the customer's priority categories, so the customer can check
// that what mattered to them ("2019–2023 family photos") came back. The file type comes from the
// extension through IANA media types as collected in mime-db (extension → media type → category);
// a short table handles extensions mime-db lacks or maps to an unrelated format.

import mimeDb from 'mime-db';
import { priorityCategories, type PriorityCategory } from '../vocabulary';

export interface FileCategory {
  category: PriorityCategory;
  /** The media type mime-db gives for the extension; null when mime-db has none we trust for it. */
  mediaType: string | null;
}

// ---------------------------------------------------------------------------------------------------
// Extension → media type, from mime-db. Several types can claim one extension (.mp4 is listed under
// application/mp4 and video/mp4); prefer the IANA-registered one, then a specific top-level type over
// application/*, then the standards tree over vnd./x-/prs. subtypes, then the shorter name.

const sourceRank: Record<string, number> = { iana: 3, apache: 1, nginx: 0 };
const unsourcedRank = 2; // entries mime-db's maintainers added themselves

function preference(type: string, source: string | undefined): number[] {
  const [topLevel, subtype = ''] = type.split('/');
  return [
    source === undefined ? unsourcedRank : (sourceRank[source] ?? 0),
    topLevel === 'application' ? 0 : 1,
    /^(vnd\.|x-|x\.|prs\.)/.test(subtype) ? 0 : 1,
    -type.length,
  ];
}

function prefers(a: number[], b: number[]): boolean {
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return a[i] > b[i];
  return false;
}

const mediaTypeByExtension: ReadonlyMap<string, string> = (() => {
  const chosen = new Map<string, { type: string; score: number[] }>();
  for (const [type, entry] of Object.entries(mimeDb)) {
    if (type === 'application/octet-stream') continue; // "any bytes" says nothing about the file
    const score = preference(type, entry.source);
    for (const extension of entry.extensions ?? []) {
      const current = chosen.get(extension);
      if (!current || prefers(score, current.score)) chosen.set(extension, { type, score });
    }
  }
  return new Map([...chosen].map(([extension, { type }]) => [extension, type]));
})();

/** The media type mime-db gives for an extension (without the dot, any case); null when it has none. */
export function mediaTypeForExtension(extension: string): string | null {
  return mediaTypeByExtension.get(extension.toLowerCase().replace(/^\./, '')) ?? null;
}

// ---------------------------------------------------------------------------------------------------
// Media type → category. First match wins; a pattern ending in "*" matches by prefix.

export interface MediaTypeRule {
  pattern: string;
  category: PriorityCategory;
  reason: string;
}

export const mediaTypeRules: readonly MediaTypeRule[] = [
  // Types under image/ that are drawings and artwork rather than photographs.
  { pattern: 'image/vnd.adobe.photoshop', category: 'design_files', reason: 'Photoshop documents are layered design work, not camera photos.' },
  { pattern: 'image/svg+xml', category: 'design_files', reason: 'SVG is vector artwork made in a design tool.' },
  { pattern: 'image/vnd.dwg', category: 'design_files', reason: 'DWG is a CAD drawing, registered under image/.' },
  { pattern: 'image/vnd.dxf', category: 'design_files', reason: 'DXF is a CAD drawing exchange file, registered under image/.' },
  { pattern: 'image/*', category: 'photos', reason: 'Raster images: camera photos, phone pictures, scans.' },
  { pattern: 'video/*', category: 'videos', reason: 'All video containers.' },
  { pattern: 'model/*', category: 'design_files', reason: '3D and CAD models (STL, STEP, OBJ, 3MF).' },
  { pattern: 'application/x-blender', category: 'design_files', reason: 'Blender 3D scenes.' },

  { pattern: 'application/vnd.ms-excel*', category: 'spreadsheets', reason: 'Excel workbooks, old and macro-enabled.' },
  { pattern: 'application/vnd.openxmlformats-officedocument.spreadsheetml.*', category: 'spreadsheets', reason: 'Excel workbooks and templates (OOXML).' },
  { pattern: 'application/vnd.oasis.opendocument.spreadsheet*', category: 'spreadsheets', reason: 'OpenDocument spreadsheets.' },
  { pattern: 'application/vnd.apple.numbers', category: 'spreadsheets', reason: 'Apple Numbers.' },
  { pattern: 'application/x-iwork-numbers-sffnumbers', category: 'spreadsheets', reason: 'Apple Numbers (older iWork type).' },
  { pattern: 'application/vnd.lotus-1-2-3', category: 'spreadsheets', reason: 'Lotus 1-2-3 worksheets.' },
  { pattern: 'text/csv', category: 'spreadsheets', reason: 'Comma-separated tables open in a spreadsheet.' },
  { pattern: 'text/tab-separated-values', category: 'spreadsheets', reason: 'Tab-separated tables open in a spreadsheet.' },

  { pattern: 'message/*', category: 'email', reason: 'Saved e-mail messages (message/rfc822).' },
  { pattern: 'application/mbox', category: 'email', reason: 'Mailbox files holding many messages.' },
  { pattern: 'application/vnd.ms-outlook', category: 'email', reason: 'Outlook saved messages (.msg).' },
  { pattern: 'application/vnd.lotus-notes', category: 'email', reason: 'Lotus Notes databases, mostly mail files.' },

  { pattern: 'application/vnd.intu.qbo', category: 'accounting', reason: 'QuickBooks Web Connect bank downloads.' },
  { pattern: 'application/vnd.intu.qfx', category: 'accounting', reason: 'Quicken bank downloads.' },
  { pattern: 'application/x-msmoney', category: 'accounting', reason: 'Microsoft Money files.' },

  { pattern: 'application/x-msaccess', category: 'databases', reason: 'Microsoft Access databases.' },
  { pattern: 'application/vnd.dbf', category: 'databases', reason: 'dBase tables.' },
  { pattern: 'application/vnd.sqlite3', category: 'databases', reason: 'SQLite databases.' },
  { pattern: 'application/sql', category: 'databases', reason: 'SQL dumps are how a database is usually backed up.' },
  { pattern: 'application/x-sql', category: 'databases', reason: 'SQL dumps.' },

  { pattern: 'text/x-c', category: 'source_code', reason: 'C and C++ sources and headers.' },
  { pattern: 'text/x-java-source', category: 'source_code', reason: 'Java sources.' },
  { pattern: 'text/javascript', category: 'source_code', reason: 'JavaScript sources.' },
  { pattern: 'application/javascript', category: 'source_code', reason: 'JavaScript sources (older type).' },
  { pattern: 'text/jsx', category: 'source_code', reason: 'React JSX sources.' },
  { pattern: 'application/node', category: 'source_code', reason: 'Node.js CommonJS modules (.cjs).' },
  { pattern: 'application/x-httpd-php', category: 'source_code', reason: 'PHP sources.' },
  { pattern: 'application/x-sh', category: 'source_code', reason: 'Shell scripts.' },
  { pattern: 'application/x-perl', category: 'source_code', reason: 'Perl scripts.' },
  { pattern: 'text/x-lua', category: 'source_code', reason: 'Lua scripts.' },
  { pattern: 'text/x-asm', category: 'source_code', reason: 'Assembly sources.' },
  { pattern: 'text/x-fortran', category: 'source_code', reason: 'Fortran sources.' },
  { pattern: 'text/x-pascal', category: 'source_code', reason: 'Pascal sources.' },
  { pattern: 'text/css', category: 'source_code', reason: 'Style sheets of web sites.' },
  { pattern: 'text/x-scss', category: 'source_code', reason: 'Sass style sheets.' },
  { pattern: 'application/x-ipynb+json', category: 'source_code', reason: 'Jupyter notebooks.' },

  { pattern: 'application/pdf', category: 'documents', reason: 'PDF documents.' },
  { pattern: 'application/msword', category: 'documents', reason: 'Word documents (old format).' },
  { pattern: 'application/vnd.ms-word*', category: 'documents', reason: 'Word macro-enabled documents and templates.' },
  { pattern: 'application/vnd.openxmlformats-officedocument.wordprocessingml.*', category: 'documents', reason: 'Word documents (OOXML).' },
  { pattern: 'application/vnd.ms-powerpoint*', category: 'documents', reason: 'PowerPoint presentations; there is no separate presentations category.' },
  { pattern: 'application/vnd.openxmlformats-officedocument.presentationml.*', category: 'documents', reason: 'PowerPoint presentations (OOXML).' },
  { pattern: 'application/vnd.oasis.opendocument.text*', category: 'documents', reason: 'OpenDocument text.' },
  { pattern: 'application/vnd.oasis.opendocument.presentation*', category: 'documents', reason: 'OpenDocument presentations.' },
  { pattern: 'application/vnd.apple.pages', category: 'documents', reason: 'Apple Pages.' },
  { pattern: 'application/vnd.apple.keynote', category: 'documents', reason: 'Apple Keynote.' },
  { pattern: 'application/x-iwork-pages-sffpages', category: 'documents', reason: 'Apple Pages (older iWork type).' },
  { pattern: 'application/x-iwork-keynote-sffkey', category: 'documents', reason: 'Apple Keynote (older iWork type).' },
  { pattern: 'application/rtf', category: 'documents', reason: 'Rich Text documents.' },
  { pattern: 'text/rtf', category: 'documents', reason: 'Rich Text documents.' },
  { pattern: 'application/epub+zip', category: 'documents', reason: 'E-books.' },
  { pattern: 'application/vnd.ms-xpsdocument', category: 'documents', reason: 'XPS documents.' },
  { pattern: 'application/oxps', category: 'documents', reason: 'OpenXPS documents.' },
  { pattern: 'application/postscript', category: 'documents', reason: 'PostScript print files (.ps); .ai and .eps are taken out as design files by extension.' },
  { pattern: 'text/plain', category: 'documents', reason: 'Plain text notes.' },
  { pattern: 'text/markdown', category: 'documents', reason: 'Markdown notes.' },
  { pattern: 'text/html', category: 'documents', reason: 'Saved web pages read as documents to most customers.' },
];

function matches(pattern: string, mediaType: string): boolean {
  return pattern.endsWith('*') ? mediaType.startsWith(pattern.slice(0, -1)) : mediaType === pattern;
}

/** Category for a media type by the rules above; `other` when none applies (audio, archives, programs…). */
export function categoryForMediaType(mediaType: string): PriorityCategory {
  const normalized = mediaType.toLowerCase();
  return mediaTypeRules.find((rule) => matches(rule.pattern, normalized))?.category ?? 'other';
}

// ---------------------------------------------------------------------------------------------------
// Extensions decided here rather than through mime-db. `keepMimeDbType`: mime-db's type is right and
// only the category differs; otherwise mime-db has no entry or one for an unrelated format, and the
// media type is reported as null rather than a wrong one.

export interface ExtensionRule {
  extensions: readonly string[];
  category: PriorityCategory;
  keepMimeDbType: boolean;
  reason: string;
}

export const extensionRules: readonly ExtensionRule[] = [
  { extensions: ['qbw', 'qbb', 'qbm', 'qbx', 'tlg'], category: 'accounting', keepMimeDbType: false, reason: 'QuickBooks company files, backups, portable and accountant copies, and transaction logs; not in mime-db.' },
  { extensions: ['iif'], category: 'accounting', keepMimeDbType: false, reason: 'Intuit Interchange Format; mime-db lists .iif under an unrelated forms format.' },
  { extensions: ['ofx', 'qif', 'qdf'], category: 'accounting', keepMimeDbType: false, reason: 'Open Financial Exchange and Quicken interchange/data files; not in mime-db.' },
  { extensions: ['gnucash'], category: 'accounting', keepMimeDbType: false, reason: 'GnuCash books; not in mime-db.' },

  { extensions: ['ai', 'eps'], category: 'design_files', keepMimeDbType: true, reason: 'Illustrator and EPS artwork; mime-db files them under application/postscript with print files.' },
  { extensions: ['psb'], category: 'design_files', keepMimeDbType: false, reason: 'Photoshop large documents; mime-db lists .psb under a 3GPP picture format.' },
  { extensions: ['skp'], category: 'design_files', keepMimeDbType: false, reason: 'SketchUp models; mime-db lists .skp under an unrelated format.' },
  { extensions: ['fig'], category: 'design_files', keepMimeDbType: false, reason: 'Figma files; mime-db lists .fig under the older Xfig drawing format.' },
  { extensions: ['sketch', 'xd', 'indd', 'idml', 'afdesign', 'afphoto', 'afpub', 'cdr', 'xcf', 'kra'], category: 'design_files', keepMimeDbType: false, reason: 'Sketch, Adobe XD and InDesign, Affinity, CorelDRAW, GIMP and Krita documents; not in mime-db.' },

  { extensions: ['cr2', 'cr3', 'crw', 'nef', 'nrw', 'arw', 'srf', 'sr2', 'orf', 'rw2', 'raf', 'srw', 'pef', 'rwl', '3fr', 'iiq'], category: 'photos', keepMimeDbType: false, reason: 'Camera raw photos (Canon, Nikon, Sony, Olympus, Panasonic, Fujifilm, Samsung, Pentax, Leica, Hasselblad, Phase One); not in mime-db.' },

  { extensions: ['pst', 'ost'], category: 'email', keepMimeDbType: false, reason: 'Outlook data files holding whole mailboxes; not in mime-db.' },
  { extensions: ['emlx', 'olm', 'dbx', 'mbx'], category: 'email', keepMimeDbType: false, reason: 'Apple Mail messages, Outlook for Mac archives, Outlook Express and Eudora mailboxes; not in mime-db.' },

  { extensions: ['sqlite', 'sqlite3', 'db', 'db3'], category: 'databases', keepMimeDbType: false, reason: 'SQLite and other embedded databases; mime-db gives these extensions no type.' },
  { extensions: ['accdb', 'fmp12', 'fdb', 'frm', 'ibd', 'myd', 'myi'], category: 'databases', keepMimeDbType: false, reason: 'Access, FileMaker, Firebird and MySQL table files; not in mime-db.' },

  { extensions: ['py', 'rb', 'go', 'cs', 'swift', 'kt', 'kts', 'scala', 'tsx', 'hpp', 'hxx', 'r', 'vb', 'bash', 'ps1'], category: 'source_code', keepMimeDbType: false, reason: 'Program sources mime-db has no type for.' },
  { extensions: ['rs'], category: 'source_code', keepMimeDbType: false, reason: 'Rust sources; mime-db lists .rs under an unrelated XML format.' },
  // .ts is left to mime-db on purpose: it is both TypeScript and MPEG transport-stream video (TV and
  // camcorder recordings), and recovered .ts files on customer drives are more often the video.
];

const extensionRuleByExtension: ReadonlyMap<string, ExtensionRule> = new Map(
  extensionRules.flatMap((rule) => rule.extensions.map((extension) => [extension, rule] as const)),
);

/** Whole file names that are not the customer's data even though their extension says otherwise. */
export const fileNameRules: readonly { names: readonly string[]; category: PriorityCategory; reason: string }[] = [
  { names: ['thumbs.db', 'ehthumbs.db', 'ehthumbs_vista.db'], category: 'other', reason: 'Windows thumbnail caches, not databases.' },
];

const fileNameRuleByName: ReadonlyMap<string, PriorityCategory> = new Map(
  fileNameRules.flatMap((rule) => rule.names.map((name) => [name, rule.category] as const)),
);

/** Lower-case extension of the last path segment; "" for none (including dot files such as ".bashrc"). */
function extensionOf(fileName: string): string {
  const dot = fileName.lastIndexOf('.');
  return dot <= 0 || dot === fileName.length - 1 ? '' : fileName.slice(dot + 1).toLowerCase();
}

/** Category and media type of a recovered file from its path (either slash direction). */
export function categoryForPath(path: string): FileCategory {
  if (typeof path !== 'string' || path.length === 0) throw new TypeError('path must be a non-empty string');
  const fileName = path.split(/[\\/]/).pop() ?? '';
  const extension = extensionOf(fileName);
  const mimeDbType = extension ? mediaTypeForExtension(extension) : null;

  const byName = fileNameRuleByName.get(fileName.toLowerCase());
  if (byName) return { category: byName, mediaType: mimeDbType };

  const rule = extensionRuleByExtension.get(extension);
  if (rule) return { category: rule.category, mediaType: rule.keepMimeDbType ? mimeDbType : null };

  return { category: mimeDbType ? categoryForMediaType(mimeDbType) : 'other', mediaType: mimeDbType };
}

// ---------------------------------------------------------------------------------------------------
// Manifest summary.

export const fileStates = ['intact', 'partial', 'unreadable'] as const;
export type FileState = (typeof fileStates)[number];

export interface ManifestRow {
  path: string;
  sizeBytes: number;
  state: FileState;
}

export interface CategorySummary {
  category: PriorityCategory;
  files: number;
  bytes: number;
  intact: number;
  partial: number;
  unreadable: number;
}

/** One summary per priority category, in vocabulary order, including empty ones so the list never shifts. */
export function summarizeManifest(rows: readonly ManifestRow[]): CategorySummary[] {
  const byCategory = new Map<PriorityCategory, CategorySummary>(
    priorityCategories.map((category) => [category, { category, files: 0, bytes: 0, intact: 0, partial: 0, unreadable: 0 }]),
  );
  rows.forEach((row, index) => {
    if (!Number.isSafeInteger(row.sizeBytes) || row.sizeBytes < 0) {
      throw new RangeError(`row ${index + 1} (${row.path}): sizeBytes must be a non-negative whole number, got ${row.sizeBytes}`);
    }
    if (!(fileStates as readonly string[]).includes(row.state)) {
      throw new RangeError(`row ${index + 1} (${row.path}): state must be one of ${fileStates.join(', ')}, got "${row.state}"`);
    }
    const summary = byCategory.get(categoryForPath(row.path).category)!;
    summary.files += 1;
    summary.bytes += row.sizeBytes;
    summary[row.state] += 1;
  });
  return [...byCategory.values()];
}

// ---------------------------------------------------------------------------------------------------
// Manifest CSV: header `path,size,state`, RFC 4180 quoting. Parsed here rather than with csv-parse,
// whose ESM build calls Node's Buffer and so does not run in the browser without a polyfill.

export interface CsvRecord {
  /** 1-based line on which the record starts. */
  line: number;
  fields: string[];
}

export class CsvSyntaxError extends Error {
  constructor(
    readonly line: number,
    message: string,
  ) {
    super(`line ${line}: ${message}`);
    this.name = 'CsvSyntaxError';
  }
}

/** RFC 4180 records: comma-separated, fields in double quotes may hold commas, newlines and doubled quotes. */
export function parseCsvRecords(text: string): CsvRecord[] {
  const records: CsvRecord[] = [];
  let fields: string[] = [];
  let field = '';
  let line = 1;
  let recordLine = 1;
  let i = 0;
  let fieldStarted = false; // the current field has content (so a quote now would be inside it)
  let recordStarted = false; // the current record has a field separator or content (for the last line)

  const endRecord = () => {
    fields.push(field);
    records.push({ line: recordLine, fields });
    fields = [];
    field = '';
    fieldStarted = false;
    recordStarted = false;
  };

  while (i < text.length) {
    const char = text[i];
    if (char === '"' && !fieldStarted) {
      // Quoted field: read up to the closing quote.
      const quoteLine = line;
      i += 1;
      for (;;) {
        if (i >= text.length) throw new CsvSyntaxError(quoteLine, 'a quoted field is not closed');
        const c = text[i];
        if (c === '"') {
          if (text[i + 1] === '"') {
            field += '"';
            i += 2;
            continue;
          }
          i += 1;
          break;
        }
        if (c === '\n') line += 1;
        field += c;
        i += 1;
      }
      fieldStarted = true;
      recordStarted = true;
      const next = text[i];
      if (next !== undefined && next !== ',' && next !== '\n' && next !== '\r') {
        throw new CsvSyntaxError(line, 'unexpected text after a closing quote; write a quote inside a quoted field as ""');
      }
      continue;
    }
    if (char === '"') {
      throw new CsvSyntaxError(line, 'a quote inside an unquoted field; put the field in quotes and double the quote');
    }
    if (char === ',') {
      fields.push(field);
      field = '';
      fieldStarted = false;
      recordStarted = true;
      i += 1;
      continue;
    }
    if (char === '\r' || char === '\n') {
      endRecord();
      i += char === '\r' && text[i + 1] === '\n' ? 2 : 1;
      line += 1;
      recordLine = line;
      continue;
    }
    field += char;
    fieldStarted = true;
    recordStarted = true;
    i += 1;
  }
  if (recordStarted) endRecord();
  return records;
}

export type ManifestField = 'path' | 'size' | 'state';

export interface ManifestError {
  line: number;
  /** The field at fault; null when the line as a whole is wrong (field count, quoting, header). */
  field: ManifestField | null;
  message: string;
}

export type ManifestParse = { ok: true; rows: ManifestRow[] } | { ok: false; errors: ManifestError[] };

const manifestHeader = ['path', 'size', 'state'] as const;

/** Parses a lab's recovered-file list; reports every bad field with its line rather than stopping at the first. */
export function parseManifestCsv(text: string): ManifestParse {
  if (typeof text !== 'string') throw new TypeError('manifest must be text');
  let records: CsvRecord[];
  try {
    records = parseCsvRecords(text.replace(/^\uFEFF/, ''));
  } catch (error) {
    if (error instanceof CsvSyntaxError) {
      return { ok: false, errors: [{ line: error.line, field: null, message: error.message.replace(/^line \d+: /, '') }] };
    }
    throw error;
  }
  const isBlank = (record: CsvRecord) => record.fields.length === 1 && record.fields[0].trim() === '';
  const nonBlank = records.filter((record) => !isBlank(record));

  const [header, ...body] = nonBlank;
  if (!header) return { ok: false, errors: [{ line: 1, field: null, message: 'the manifest is empty; expected the header path,size,state' }] };
  const headerNames = header.fields.map((name) => name.trim().toLowerCase());
  if (headerNames.join(',') !== manifestHeader.join(',')) {
    return {
      ok: false,
      errors: [{ line: header.line, field: null, message: `expected the header path,size,state, found ${header.fields.join(',')}` }],
    };
  }

  const rows: ManifestRow[] = [];
  const errors: ManifestError[] = [];
  for (const { line, fields } of body) {
    if (fields.length !== manifestHeader.length) {
      errors.push({ line, field: null, message: `expected 3 fields (path,size,state), found ${fields.length}` });
      continue;
    }
    const [path, sizeText, stateText] = fields;
    const lineErrors: ManifestError[] = [];
    if (path.trim() === '') lineErrors.push({ line, field: 'path', message: 'path is empty' });
    const size = sizeText.trim();
    if (!/^\d+$/.test(size) || !Number.isSafeInteger(Number(size))) {
      lineErrors.push({ line, field: 'size', message: `size must be a whole number of bytes, found "${sizeText}"` });
    }
    const state = stateText.trim().toLowerCase();
    if (!(fileStates as readonly string[]).includes(state)) {
      lineErrors.push({ line, field: 'state', message: `state must be intact, partial or unreadable, found "${stateText}"` });
    }
    if (lineErrors.length > 0) errors.push(...lineErrors);
    else rows.push({ path, sizeBytes: Number(size), state: state as FileState });
  }
  return errors.length > 0 ? { ok: false, errors } : { ok: true, rows };
}
