import { readFileSync } from "node:fs";
import { basename, extname } from "node:path";
import { parseArgs } from "node:util";
import { writeFileAtomic } from "../atomic-file.js";
import { importCatalogCsv, problemLine } from "./csv-import.js";
import { catalogFile } from "../../contracts/catalog.js";
import { catalogOf } from "./file-catalog.js";

export const CATALOG_USAGE = `  backstop catalog import --csv parts.csv --out parts.json [--name "catalog name"]
  columns are dotted paths into a part, as the batch's CSV columns: id, description, stage.kind, stage.diode.model, ...
  (a row is named as the batch names a CSV's rows: row N counts the data rows from 1, then the line of the file it
  starts on, "row 17 (line 18 of the file)"); --name defaults to the CSV file's name.
  every bad cell is listed (row, column, what to type instead) and nothing is written; exit 0 written, 1 refused, 2 could not run.`;

/** `backstop catalog import …`: exit 0 written, 1 refused (every bad cell on stderr), 2 could not run. */
export function catalogCommand(argv: string[], log: (line: string) => void): number {
  const [verb, ...rest] = argv;
  if (verb !== "import") throw new Error(`unknown catalog command "${verb ?? ""}" (backstop catalog import)`);
  const { values } = parseArgs({
    args: rest,
    options: { csv: { type: "string" }, out: { type: "string" }, name: { type: "string" } },
  });
  if (values.csv === undefined || values.out === undefined)
    throw new Error("backstop catalog import needs --csv and --out");
  const name = values.name ?? basename(values.csv, extname(values.csv));
  if (name.trim() === "") throw new Error("--name: the catalog needs a name");
  const result = importCatalogCsv(readFileSync(values.csv, "utf8"), name);
  if (!result.ok) {
    log(
      `backstop catalog import: ${values.csv} refused, ${result.problems.length} bad cell(s) in ${result.rows} rows; nothing written to ${values.out}`,
    );
    for (const p of result.problems) log(`  ${problemLine(p)}`);
    return 1;
  }
  // the stamp the server will give this file (its parts as the contract reads them)
  const { stamp } = catalogOf(name, catalogFile.parse(result.file).parts);
  writeFileAtomic(values.out, `${JSON.stringify(result.file, null, 2)}\n`);
  log(`backstop catalog import: ${stamp.partCount} parts -> ${values.out} (catalog "${stamp.id}", ${stamp.hash})`);
  return 0;
}
