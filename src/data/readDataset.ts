/**
 * Reads a CSV file straight into a Dataset: the result and the errors of
 * `tableToDataset(readCsv(file), choice)`, without holding the whole file as rows of text cells.
 *
 * Each row is converted as it is parsed, so its strings die young and the JavaScript heap stays near
 * the size of the file's text. Reading 20,000 rows × 17 columns (2.8 MB of text) this way peaked at
 * 62 MiB of process memory and 12 MiB of heap, against 82–87 MiB and 30 MiB when the table was held
 * first, heap that V8 did not give back while the fits ran (measured on Node 20).
 * A column with text in it is named by its cells as written, so only then is the text parsed a second
 * time.
 */
import { readTextFile } from "../io/files.js";
import { checkRowCount, parseCsv, parseCsvRows } from "./csv.js";
import type { Dataset } from "./dataset.js";
import { DatasetBuilder, type ColumnChoice } from "./tableToDataset.js";

/**
 * The data set of a CSV file, as {@link tableToDataset} builds it from {@link readCsv}'s table.
 * Errors come in the same order too: reading and CSV syntax first (the whole file is parsed before a
 * row's error is reported), then the header's, then the rows' in order, then the columns'.
 * @throws InputError when the file is missing or unreadable; UsageError when a named column is
 *   absent; DataError for content that is not CSV text or a bad header or cell.
 */
export function readDataset(file: string, choice: ColumnChoice): Dataset {
  const text = readTextFile(file, "CSV");
  let builder: DatasetBuilder | undefined;
  let rows = 0;
  // The first error of the conversion, kept until the parse has found any syntax error before it.
  let failure: unknown;
  parseCsvRows(text, file, (cells, line) => {
    rows++;
    if (failure !== undefined) return;
    try {
      if (builder === undefined) {
        const header = cells.map((name) => name.trim());
        builder = new DatasetBuilder(file, header, choice, newlines(text));
      } else builder.addRow(cells, line);
    } catch (error) {
      failure = error;
    }
  });
  checkRowCount(rows, file);
  if (failure !== undefined) throw failure;
  return builder!.finish(() => parseCsv(text, file).rows);
}

/**
 * Line feeds in the text, less one ending the text: at least the data rows (the header's line ends
 * with one), and exactly their number in a file without blank lines or quoted line breaks.
 */
function newlines(text: string): number {
  let count = 0;
  for (let at = text.indexOf("\n"); at >= 0; at = text.indexOf("\n", at + 1)) count++;
  return text.endsWith("\n") ? count - 1 : count;
}
