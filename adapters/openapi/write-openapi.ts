import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { openApiText } from "../../api/openapi.js";
import { projectRoot } from "../project-root.js";

/** `npm run openapi`: write contracts/openapi.json from the router and the zod contracts. */
const file = join(projectRoot(), "contracts", "openapi.json");
writeFileSync(file, openApiText());
process.stdout.write(`wrote ${file}\n`);
