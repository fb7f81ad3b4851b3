/** exceljs internals lib/export/workbook.ts calls (exceljs ships no types for them): the serialiser of xl/workbook.xml. */
declare module 'exceljs/lib/xlsx/xform/book/workbook-xform' {
  class WorkbookXform {
    prepare(model: unknown): void;
    toXml(model: unknown): string;
  }
  export = WorkbookXform;
}

/** exceljs's XML text escaping, which lib/export/workbook.ts's row writer uses as exceljs's own does. */
declare module 'exceljs/lib/utils/utils' {
  export function xmlEncode(text: string): string;
}
