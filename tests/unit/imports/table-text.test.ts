import { describe, expect, it } from 'vitest';
import { detectDelimiter, readPastedTable, splitDelimited } from '../../../api/features/imports/table-text';
import { parsePastedBlock } from '../../../web/features/campaigns/lib/grid';
import { parseScreen } from '../../../web/features/calculators/lib/parse-screen';

describe('the one table reader', () => {
  it('when a semicolon table has decimal commas, then the semicolon is the delimiter for files and pastes alike', () => {
    const text = 'T;ee\n-20;98,8\n0;97,9\n';
    expect(detectDelimiter(text)).toBe(';');
    expect(readPastedTable(text).delimiter).toBe(';');
    expect(parsePastedBlock(text)).toEqual([
      ['T', 'ee'],
      ['-20', '98,8'],
      ['0', '97,9'],
    ]);
  });

  it('when fields are quoted, then the file import, the grid and the calculator all read the quoted comma as part of the field', () => {
    const text = 'T,sample\n-20,"A,1"\n0,"B,2"';
    expect(splitDelimited(text, ',')).toEqual([
      ['T', 'sample'],
      ['-20', 'A,1'],
      ['0', 'B,2'],
    ]);
    expect(parsePastedBlock(text)![1]).toEqual(['-20', 'A,1']);
    const screen = parseScreen('-20,"98.8"\n0,"97.9"', 'ee', 'C');
    expect(screen.errors).toEqual([]);
    expect(screen.rows.map((r) => r.selectivity)).toEqual([98.8, 97.9]);
  });

  it('when no separator splits the lines consistently, then the one found on most lines is used, else spaces', () => {
    expect(readPastedTable('-40, 96.9\n-20; ninety\n0, 93.7, 0.4, 7').delimiter).toBe(',');
    expect(readPastedTable('-40 96.9\n-20 95.1').rows.map((r) => r.cells)).toEqual([
      ['-40', '96.9'],
      ['-20', '95.1'],
    ]);
  });

  it('when blank lines and # comments are pasted, then blank lines are skipped and comments only where asked', () => {
    const table = readPastedTable('# note\n\n-20\t98.8\n', { comments: true });
    expect(table.rows).toEqual([{ line: 3, cells: ['-20', '98.8'] }]);
    expect(readPastedTable('#12\t98.8\n#13\t97.1').rows.map((r) => r.cells[0])).toEqual(['#12', '#13']);
  });
});
