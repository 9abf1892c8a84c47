// Writes schema/study.schema.json from the zod definition of the study format.
// Run: npm run schema (a test fails when the committed file is out of date).
import { writeFileSync } from "node:fs";
import { studyJsonSchema } from "../src/study/json-schema.ts";

writeFileSync(new URL("../schema/study.schema.json", import.meta.url), studyJsonSchema());
