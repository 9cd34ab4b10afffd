/**
 * Where a CSV data row is: the one numbering of the batch's CSV input and the catalog import.
 * `row` counts the data rows from 1 (the header is not one; a blank row is), so a batch's output
 * `line` for a CSV input is its row; `fileLine` is the line of the file the row starts on (the
 * header is line 1; a quoted cell may hold line breaks, so a row may start further down).
 */
export interface CsvRowPlace {
  readonly row: number;
  readonly fileLine: number;
}

/** A row's place in words, as both say it: `row 3 (line 4 of the file)`. */
export const csvPlaceText = (p: CsvRowPlace): string => `row ${p.row} (line ${p.fileLine} of the file)`;

/** The header's place in words. */
export const CSV_HEADER_TEXT = "the header (line 1 of the file)";

/**
 * The places of a CSV's rows as csv-parse reads them with `info: true` (and skip_empty_lines
 * false, no comments): call it with each record's `info.lines` (the line the record ends on), in
 * order, the header first; it answers undefined for the header and each data row's place after it.
 */
export function csvRowCounter(): (endLine: number) => CsvRowPlace | undefined {
  let lastEnd = 0;
  let row = -1;
  return (endLine) => {
    const fileLine = lastEnd + 1;
    lastEnd = endLine;
    row += 1;
    return row === 0 ? undefined : { row, fileLine };
  };
}
