import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import mimeDb from 'mime-db';
import { parse as csvParseReference } from 'csv-parse/sync';
import { priorityCategories } from '../vocabulary';
import {
  categoryForMediaType,
  categoryForPath,
  extensionRules,
  mediaTypeForExtension,
  mediaTypeRules,
  parseCsvRecords,
  parseManifestCsv,
  summarizeManifest,
} from './file-categories';

describe('categoryForPath, through IANA media types from mime-db', () => {
  it.each([
    ['DCIM/100CANON/IMG_0412.JPG', 'image/jpeg', 'photos'],
    ['Pictures/beach.heic', 'image/heic', 'photos'],
    ['Videos/birthday.mov', 'video/quicktime', 'videos'],
    ['Finance/budget.xlsx', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet', 'spreadsheets'],
    ['Finance/old.xls', 'application/vnd.ms-excel', 'spreadsheets'],
    ['export.csv', 'text/csv', 'spreadsheets'],
    ['Mail/receipt.eml', 'message/rfc822', 'email'],
    ['Mail/archive.mbox', 'application/mbox', 'email'],
    ['Docs/contract.pdf', 'application/pdf', 'documents'],
    ['Docs/letter.docx', 'application/vnd.openxmlformats-officedocument.wordprocessingml.document', 'documents'],
    ['Art/cover.psd', 'image/vnd.adobe.photoshop', 'design_files'],
    ['Art/logo.svg', 'image/svg+xml', 'design_files'],
    ['CAD/bracket.dwg', 'image/vnd.dwg', 'design_files'],
    ['CAD/part.stl', 'model/stl', 'design_files'],
    ['src/main.c', 'text/x-c', 'source_code'],
    ['src/App.java', 'text/x-java-source', 'source_code'],
    ['web/app.js', 'text/javascript', 'source_code'],
    ['backup/shop.sql', 'application/sql', 'databases'],
    ['db/inventory.mdb', 'application/x-msaccess', 'databases'],
    ['Downloads/bank.qfx', 'application/vnd.intu.qfx', 'accounting'],
    ['Music/song.mp3', 'audio/mpeg', 'other'],
  ])('%s → %s → %s (media type from mime-db 1.54)', (path, mediaType, category) => {
    expect(mimeDb[mediaType]?.extensions, `mime-db lists ${mediaType}`).toContain(path.split('.').pop()!.toLowerCase());
    expect(categoryForPath(path)).toEqual({ category, mediaType });
  });

  it('picks video/mp4 for .mp4, which mime-db also lists under application/mp4 (both IANA)', () => {
    expect(mimeDb['application/mp4'].extensions).toContain('mp4');
    expect(mimeDb['video/mp4'].extensions).toContain('mp4');
    expect(categoryForPath('clip.mp4')).toEqual({ category: 'videos', mediaType: 'video/mp4' });
  });

  it('picks video/mp2t for camcorder .mts, which mime-db also lists under model/vnd.mts', () => {
    expect(mimeDb['model/vnd.mts'].extensions).toContain('mts');
    expect(categoryForPath('AVCHD/STREAM/00001.MTS')).toEqual({ category: 'videos', mediaType: 'video/mp2t' });
  });

  it('reads Windows paths, upper-case extensions and only the last extension', () => {
    expect(categoryForPath('C:\\Users\\ann\\Desktop\\Q3 Report.DOCX').category).toBe('documents');
    expect(categoryForPath('backups/site.tar.gz')).toEqual({ category: 'other', mediaType: 'application/gzip' });
  });

  it('puts an unknown extension, a missing extension and a dot file in other, with no media type', () => {
    expect(categoryForPath('data/blob.zzq9')).toEqual({ category: 'other', mediaType: null });
    expect(categoryForPath('README')).toEqual({ category: 'other', mediaType: null });
    expect(categoryForPath('home/.bashrc')).toEqual({ category: 'other', mediaType: null });
    expect(categoryForPath('odd.')).toEqual({ category: 'other', mediaType: null });
  });

  it('uses the explicit table where mime-db has no entry, with no media type invented', () => {
    expect(categoryForPath('QuickBooks/Company.QBW')).toEqual({ category: 'accounting', mediaType: null });
    expect(categoryForPath('app/data.sqlite')).toEqual({ category: 'databases', mediaType: null });
    expect(categoryForPath('Outlook/archive.pst')).toEqual({ category: 'email', mediaType: null });
    expect(categoryForPath('RAW/DSC_0001.NEF')).toEqual({ category: 'photos', mediaType: null });
    expect(categoryForPath('ui/mockup.sketch')).toEqual({ category: 'design_files', mediaType: null });
    expect(categoryForPath('tool/main.py')).toEqual({ category: 'source_code', mediaType: null });
  });

  it('keeps mime-db\'s application/postscript for .ai while filing it as a design file, and .ps as a document', () => {
    expect(categoryForPath('logo.ai')).toEqual({ category: 'design_files', mediaType: 'application/postscript' });
    expect(categoryForPath('print.ps')).toEqual({ category: 'documents', mediaType: 'application/postscript' });
  });

  it('does not report mime-db\'s unrelated type for .rs (Rust) or .psb (Photoshop large document)', () => {
    expect(mediaTypeForExtension('rs')).toBe('application/rls-services+xml');
    expect(categoryForPath('src/lib.rs')).toEqual({ category: 'source_code', mediaType: null });
    expect(categoryForPath('art/poster.psb')).toEqual({ category: 'design_files', mediaType: null });
  });

  it('files Windows thumbnail caches as other, not databases', () => {
    expect(categoryForPath('Photos/Thumbs.db').category).toBe('other');
    expect(categoryForPath('app/cache.db').category).toBe('databases');
  });

  it('leaves .ts to mime-db (MPEG transport stream video), as documented in the table', () => {
    expect(categoryForPath('recordings/news.ts')).toEqual({ category: 'videos', mediaType: 'video/mp2t' });
  });

  it('refuses an empty path', () => {
    expect(() => categoryForPath('')).toThrow(/non-empty/);
  });
});

describe('the rule tables, checked against mime-db', () => {
  it('every media-type rule matches at least one type in mime-db', () => {
    const types = Object.keys(mimeDb);
    for (const rule of mediaTypeRules) {
      const prefix = rule.pattern.endsWith('*') ? rule.pattern.slice(0, -1) : null;
      const hit = prefix ? types.some((type) => type.startsWith(prefix)) : types.includes(rule.pattern);
      expect(hit, rule.pattern).toBe(true);
      expect(rule.reason.length, rule.pattern).toBeGreaterThan(3);
    }
  });

  it('every extension row is needed: mime-db has no type for it, or one that would give another category', () => {
    for (const rule of extensionRules) {
      for (const extension of rule.extensions) {
        const type = mediaTypeForExtension(extension);
        if (rule.keepMimeDbType) expect(type, extension).not.toBeNull();
        if (type !== null) expect(categoryForMediaType(type), `${extension} (${type})`).not.toBe(rule.category);
      }
      expect(rule.reason.length).toBeGreaterThan(10);
    }
  });

  it('every category of the vocabulary except other is reachable from a path', () => {
    const samples = ['a.jpg', 'a.mov', 'a.pdf', 'a.xlsx', 'a.eml', 'a.qbw', 'a.psd', 'a.py', 'a.sqlite', 'a.zip'];
    expect(new Set(samples.map((path) => categoryForPath(path).category))).toEqual(new Set(priorityCategories));
  });
});

describe('summarizeManifest', () => {
  it('counts files, bytes and states per category, listing every category in vocabulary order', () => {
    const summary = summarizeManifest([
      { path: 'a.jpg', sizeBytes: 3_000_000, state: 'intact' },
      { path: 'b.JPG', sizeBytes: 2_000_000, state: 'partial' },
      { path: 'c.png', sizeBytes: 0, state: 'unreadable' },
      { path: 'd.xlsx', sizeBytes: 40_000, state: 'intact' },
      { path: 'e.bin', sizeBytes: 10, state: 'intact' },
    ]);
    expect(summary.map((s) => s.category)).toEqual([...priorityCategories]);
    expect(summary.find((s) => s.category === 'photos')).toEqual({
      category: 'photos',
      files: 3,
      bytes: 5_000_000,
      intact: 1,
      partial: 1,
      unreadable: 1,
    });
    expect(summary.find((s) => s.category === 'spreadsheets')).toMatchObject({ files: 1, bytes: 40_000, intact: 1 });
    expect(summary.find((s) => s.category === 'other')).toMatchObject({ files: 1, bytes: 10 });
    expect(summary.find((s) => s.category === 'email')).toMatchObject({ files: 0, bytes: 0 });
  });

  it('refuses a negative size or an unknown state, naming the row', () => {
    expect(() => summarizeManifest([{ path: 'a.jpg', sizeBytes: -1, state: 'intact' }])).toThrow(/row 1 \(a\.jpg\): sizeBytes/);
    expect(() => summarizeManifest([{ path: 'a.jpg', sizeBytes: 1, state: 'lost' as never }])).toThrow(/state must be one of/);
  });
});

describe('parseManifestCsv', () => {
  it('reads rows under the header path,size,state', () => {
    const result = parseManifestCsv('path,size,state\nPhotos/a.jpg,1024,intact\nDocs/b.pdf,2048,partial\n');
    expect(result).toEqual({
      ok: true,
      rows: [
        { path: 'Photos/a.jpg', sizeBytes: 1024, state: 'intact' },
        { path: 'Docs/b.pdf', sizeBytes: 2048, state: 'partial' },
      ],
    });
  });

  it('reads quoted paths holding commas, doubled quotes and a line break (RFC 4180), with CRLF and a BOM', () => {
    const text = '\uFEFFpath,size,state\r\n"Clients/Smith, J/""final"".docx",10,intact\r\n"notes/line\r\nbreak.txt",5,unreadable\r\n';
    expect(parseManifestCsv(text)).toEqual({
      ok: true,
      rows: [
        { path: 'Clients/Smith, J/"final".docx', sizeBytes: 10, state: 'intact' },
        { path: 'notes/line\r\nbreak.txt', sizeBytes: 5, state: 'unreadable' },
      ],
    });
  });

  it('skips blank lines and accepts a header and states in any case', () => {
    const result = parseManifestCsv('Path,Size,State\n\na.jpg,1,INTACT\n\n');
    expect(result).toEqual({ ok: true, rows: [{ path: 'a.jpg', sizeBytes: 1, state: 'intact' }] });
  });

  it('reports each bad field with its line number and field name', () => {
    const text = ['path,size,state', 'a.jpg,100,intact', 'b.jpg,12kB,intact', 'c.jpg,5,gone', ',7,partial'].join('\n');
    const result = parseManifestCsv(text);
    expect(result).toEqual({
      ok: false,
      errors: [
        { line: 3, field: 'size', message: 'size must be a whole number of bytes, found "12kB"' },
        { line: 4, field: 'state', message: 'state must be intact, partial or unreadable, found "gone"' },
        { line: 5, field: 'path', message: 'path is empty' },
      ],
    });
  });

  it('counts lines inside a quoted multi-line field when reporting a later line', () => {
    const result = parseManifestCsv('path,size,state\n"two\nlines.txt",1,intact\nx.txt,-4,intact\n');
    expect(result).toMatchObject({ ok: false, errors: [{ line: 4, field: 'size' }] });
  });

  it('reports a line with the wrong number of fields', () => {
    expect(parseManifestCsv('path,size,state\na.jpg,1\n')).toEqual({
      ok: false,
      errors: [{ line: 2, field: null, message: 'expected 3 fields (path,size,state), found 2' }],
    });
  });

  it('reports an unclosed quote at the line where it opens, and a stray quote', () => {
    expect(parseManifestCsv('path,size,state\na.jpg,1,intact\n"b.jpg,2,intact\n')).toMatchObject({
      ok: false,
      errors: [{ line: 3, field: null, message: expect.stringMatching(/not closed/) }],
    });
    expect(parseManifestCsv('path,size,state\nb"c.jpg,2,intact\n')).toMatchObject({
      ok: false,
      errors: [{ line: 2, message: expect.stringMatching(/quote inside an unquoted field/) }],
    });
  });

  it('reports a wrong or missing header at its line', () => {
    expect(parseManifestCsv('file,bytes,status\na.jpg,1,intact')).toMatchObject({ ok: false, errors: [{ line: 1, field: null }] });
    expect(parseManifestCsv('')).toMatchObject({ ok: false, errors: [{ line: 1, message: expect.stringMatching(/empty/) }] });
  });
});

describe('parseCsvRecords, checked against the csv-parse library', () => {
  const fieldChars = fc.constantFrom('a', 'Z', '7', ' ', ',', '"', '\n', '\r\n', 'é', '/', '.');
  const field = fc.array(fieldChars, { maxLength: 6 }).map((parts) => parts.join(''));
  // A record of a single empty field is a blank line, which csv-parse and we both treat differently
  // by design (we keep it for the caller to skip); keep records to two or more fields.
  const record = fc.array(field, { minLength: 2, maxLength: 4 });

  function encode(value: string, forceQuotes: boolean): string {
    return forceQuotes || /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
  }

  it('property: gives the same fields as csv-parse/sync for any RFC 4180 text', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(record, fc.boolean()), { minLength: 1, maxLength: 5 }), fc.boolean(), (rows, crlf) => {
        const newline = crlf ? '\r\n' : '\n';
        const text = rows.map(([fields, quoteAll]) => fields.map((f) => encode(f, quoteAll)).join(',')).join(newline);
        const expected = csvParseReference(text, { relax_column_count: true }) as string[][];
        expect(parseCsvRecords(text).map((r) => r.fields)).toEqual(expected);
      }),
    );
  });

  it('gives the starting line of each record', () => {
    expect(parseCsvRecords('a,b\n"c\nd",e\nf,g').map((r) => r.line)).toEqual([1, 2, 4]);
  });
});
