/** exceljs's serialiser of xl/workbook.xml, which lib/export/workbook.ts calls (exceljs ships no types for its internals). */
declare module 'exceljs/lib/xlsx/xform/book/workbook-xform' {
  class WorkbookXform {
    prepare(model: unknown): void;
    toXml(model: unknown): string;
  }
  export = WorkbookXform;
}
