import { writeFileSync } from "node:fs";
import { join } from "node:path";
import { projectRoot } from "../project-root.js";
import { committedOpenApiText } from "./document.js";

/** `npm run openapi`: write contracts/openapi.json from the router and the zod contracts. */
const file = join(projectRoot(), "contracts", "openapi.json");
writeFileSync(file, committedOpenApiText());
process.stdout.write(`wrote ${file}\n`);
