import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { coreVersion } from '../../src/core/core-version.ts';
import { csvCell, csvColumns, readsToCsv } from '../../src/core/csv-export.ts';
import type { CsvExportInput } from '../../src/core/csv-export.ts';
import { defaultPolicy } from '../../src/core/unit-policy.ts';
import { at, counts, makeAmendment, makeRead, makeStay, ward } from './fixtures/ward-reads.ts';

/** A small RFC 4180 reader for the tests: quoted fields, doubled quotes, CRLF records. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < text.length; i += 1) {
    const ch = text[i]!;
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        field += '"';
        i += 1;
      } else if (ch === '"') quoted = false;
      else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      row.push(field);
      field = '';
    } else if (ch === '\r' && text[i + 1] === '\n') {
      row.push(field);
      rows.push(row);
      row = [];
      field = '';
      i += 1;
    } else field += ch;
  }
  return rows;
}

const stay = makeStay({ baselineQtcMs: 430 });
const prolonged = makeRead('read-csv-0001', '2026-03-10T06:00:00Z', counts.exampleF, { notes: 'Pt says "dizzy", resting.\nEscalated to the on-call doctor' });
const noQt = makeRead('read-csv-0002', '2026-03-10T10:00:00Z', counts.noQt, { rhythmText: '=HYPERLINK("http://example.invalid")', ectopy: '+PVCs', reason: 'alarm', reasonText: '@monitor alarm' });
const wide = makeRead('read-csv-0003', '2026-03-10T14:00:00Z', counts.wideQrsExampleI);
const broken = makeRead('read-csv-0004', '2026-03-10T15:00:00Z', { ...counts.exampleA, qtSmallBoxes: 30 });
const amendment = makeAmendment('amend-csv-0001', wide.id, '2026-03-10T15:30:00Z', { notes: '-recounted' }, 'Added a note');

function exportOf(overrides: Partial<CsvExportInput> = {}) {
  return readsToCsv({ unit: ward, stays: [{ stay, bedLabel: 'Bed 4', reads: [wide, broken, noQt, prolonged], amendments: [amendment] }], ...overrides }, defaultPolicy);
}

describe('the CSV header', () => {
  it('documents every column, in order, with a description', () => {
    const header = parseCsv(exportOf().csv)[0];
    expect(header).toEqual(csvColumns.map((c) => c.name));
    expect(csvColumns.every((c) => c.description.length > 10)).toBe(true);
    expect(header?.slice(0, 4)).toEqual(['read_id', 'stay_alias', 'bed', 'strip_time']);
    expect(header).toContain('qtc_fridericia_ms');
    expect(header?.at(-1)).toBe('problems');
  });

  it('is documented column by column, in order, in the README', () => {
    const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
    const section = readme.slice(readme.indexOf('### CSV'), readme.indexOf('### FHIR R4'));
    const documented = [...section.matchAll(/^\| \d+ \| `([a-z0-9_]+)` \|/gm)].map((m) => m[1]);
    expect(documented).toEqual(csvColumns.map((c) => c.name));
  });
});

describe('one row per read', () => {
  const result = exportOf();
  const rows = parseCsv(result.csv);
  const header = rows[0]!;
  const rowOf = (readId: string): Record<string, string> => Object.fromEntries(header.map((name, i) => [name, rows.find((r) => r[0] === readId)![i]!]));

  it('writes the reads in strip-time order with CRLF line ends and a final CRLF (RFC 4180)', () => {
    expect(result.rowCount).toBe(4);
    expect(rows.slice(1).map((r) => r[0])).toEqual(['read-csv-0001', 'read-csv-0002', 'read-csv-0003', 'read-csv-0004']);
    expect(result.csv.endsWith('\r\n')).toBe(true);
    expect(rows.every((r) => r.length === csvColumns.length)).toBe(true);
  });

  it('gives the strip time with the offset of the unit time zone', () => {
    expect(rowOf(prolonged.id)).toMatchObject({ strip_time: '2026-03-10T07:00:00+01:00', signed_at: '2026-03-10T07:03:00+01:00', stay_alias: 'R.T.', bed: 'Bed 4', author: 'M. Okafor' });
  });

  it('writes the counts as entered and the figures with one decimal: Ex F QTc Bazett 581.4, Fridericia 560.2, Framingham 550.8, Hodges 546.3 (clinical-reference §4a)', () => {
    expect(rowOf(prolonged.id)).toMatchObject({
      paper_speed_mm_per_s: '25',
      rr_small_boxes: '20 20',
      qt_small_boxes: '13',
      rate_bpm: '75',
      rate_method: 'mean-rr',
      regularity: 'regular',
      pr_ms: '160',
      qrs_ms: '80',
      qt_ms: '520',
      rr_used_for_qtc_ms: '800',
      qtc_bazett_ms: '581.4',
      qtc_fridericia_ms: '560.2',
      qtc_framingham_ms: '550.8',
      qtc_hodges_ms: '546.3',
      qtc_default_formula: 'fridericia',
      qtc_for_limits_ms: '560.2',
      qtc_for_limits_basis: 'plain',
      qtc_approximate: 'no',
      core_version: coreVersion,
      amended: 'no',
    });
  });

  it('lists the flags as code:severity, most severe first (Drew et al. 2010: >= 500 ms and > 60 ms rise)', () => {
    expect(rowOf(prolonged.id).flags).toBe('qtc-high-risk:urgent; qtc-rise-from-baseline:urgent');
  });

  it('rounds 71.43 bpm to 71.4 and leaves QT columns empty when no QT was counted', () => {
    expect(rowOf(noQt.id)).toMatchObject({ rate_bpm: '71.4', rate_method: 'single-rr', regularity: 'unknown', qt_ms: '', qtc_fridericia_ms: '', qtc_approximate: '' });
  });

  it('gives the wide-QRS adjusted figure the limits used (QT - 0.5 x QRS, Fridericia 430.9; Bogossian et al. 2014)', () => {
    expect(rowOf(wide.id)).toMatchObject({ qtc_fridericia_ms: '517.1', qtc_for_limits_ms: '430.9', qtc_for_limits_basis: 'modified-qt', qrs_ms: '160' });
    expect(rowOf(wide.id).flags).toBe('qrs-wide:caution; qrs-newly-wide:caution');
  });

  it('marks amended reads and shows the values after the amendment', () => {
    expect(rowOf(wide.id)).toMatchObject({ amended: 'yes', amendment_count: '1', notes: "'-recounted" });
  });

  it('keeps a read whose counts cannot be derived, with the reason and empty figures', () => {
    const row = rowOf(broken.id);
    expect(row.qt_small_boxes).toBe('30');
    expect(row.rate_bpm).toBe('');
    expect(row.problems).toMatch(/^qtSmallBoxes must be between 3 and 25 small boxes at 25 mm\/s/);
    expect(result.problems.map((p) => p.readId)).toEqual([broken.id]);
  });
});

describe('quoting and formula guard', () => {
  const rows = parseCsv(exportOf().csv);
  const header = rows[0]!;
  const cell = (readId: string, name: string) => rows.find((r) => r[0] === readId)![header.indexOf(name)];

  it('quotes commas, quotes and line breaks, doubling inner quotes (RFC 4180)', () => {
    expect(csvCell('a,b')).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell('two\r\nlines')).toBe('"two\r\nlines"');
    expect(csvCell('plain')).toBe('plain');
    expect(cell(prolonged.id, 'notes')).toBe('Pt says "dizzy", resting.\nEscalated to the on-call doctor');
  });

  it('prefixes cells starting with = + - @ with a single quote so spreadsheets do not run them', () => {
    expect(cell(noQt.id, 'rhythm_text')).toBe('\'=HYPERLINK("http://example.invalid")');
    expect(cell(noQt.id, 'ectopy')).toBe("'+PVCs");
    expect(cell(noQt.id, 'reason_text')).toBe("'@monitor alarm");
    expect(csvCell('-1')).toBe("'-1");
    expect(csvCell('\tcmd')).toBe("'\tcmd");
    expect(csvCell('=1+2,3')).toBe('"\'=1+2,3"');
  });
});

describe('scope and options', () => {
  it('exports only a shift when given its bounds', () => {
    const shift = exportOf({ fromMs: at('2026-03-10T06:00:00Z'), toMs: at('2026-03-10T14:00:00Z') });
    expect(parseCsv(shift.csv).slice(1).map((r) => r[0])).toEqual([prolonged.id, noQt.id]);
  });

  it('writes just the header for a bed with no reads', () => {
    const empty = readsToCsv({ unit: ward, stays: [{ stay, bedLabel: 'Bed 4', reads: [], amendments: [] }] }, defaultPolicy);
    expect(empty.rowCount).toBe(0);
    expect(empty.csv).toBe(`${csvColumns.map((c) => c.name).join(',')}\r\n`);
  });

  it('adds a byte-order mark only when asked', () => {
    expect(exportOf().csv.startsWith('read_id')).toBe(true);
    expect(exportOf({ byteOrderMark: true }).csv.startsWith('\uFEFFread_id')).toBe(true);
  });

  it('joins several stays under one header', () => {
    const other = makeStay({ id: 'stay-bed5-0001', alias: 'K.W.', bedId: 'bed-00000005' });
    const otherRead = makeRead('read-csv-0101', '2026-03-10T08:00:00Z', counts.exampleA, { stayId: other.id });
    const both = readsToCsv({ unit: ward, stays: [{ stay, bedLabel: 'Bed 4', reads: [prolonged], amendments: [] }, { stay: other, bedLabel: 'Bed 5', reads: [otherRead], amendments: [] }] }, defaultPolicy);
    expect(parseCsv(both.csv).slice(1).map((r) => [r[1], r[2]])).toEqual([
      ['R.T.', 'Bed 4'],
      ['K.W.', 'Bed 5'],
    ]);
  });

  it('refuses a range that ends before it starts, naming the field', () => {
    expect(() => exportOf({ fromMs: 10, toMs: 10 })).toThrow('toMs must be after fromMs');
  });
});
