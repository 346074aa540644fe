import ExcelJS from 'exceljs';
import Papa from 'papaparse';

/** A sheet: a header row a person understands, then the rows. */
export interface Sheet {
  name: string;
  header: string[];
  rows: (string | number | boolean | null)[][];
}

/** CSV of one sheet. */
export function sheetCsv(sheet: Sheet): string {
  return Papa.unparse(
    { fields: sheet.header, data: sheet.rows.map((r) => r.map((v) => v ?? '')) },
    { newline: '\n' },
  );
}

/** An XLSX workbook of sheets (bold, frozen header row; sensible column widths). */
export async function workbook(sheets: Sheet[]): Promise<Buffer> {
  const book = new ExcelJS.Workbook();
  book.creator = 'Maculo';
  for (const sheet of sheets) {
    const ws = book.addWorksheet(sheet.name.slice(0, 31));
    ws.addRow(sheet.header).font = { bold: true };
    for (const row of sheet.rows) ws.addRow(row.map((v) => (v === null ? '' : v)));
    ws.views = [{ state: 'frozen', ySplit: 1 }];
    ws.columns.forEach((column, i) => {
      const longest = Math.max(
        sheet.header[i]?.length ?? 8,
        ...sheet.rows.slice(0, 200).map((r) => String(r[i] ?? '').length),
      );
      column.width = Math.min(60, Math.max(8, longest + 2));
    });
  }
  return Buffer.from(await book.xlsx.writeBuffer());
}
