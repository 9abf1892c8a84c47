import { z } from "zod";
import { studySchema } from "./schema.ts";

/** The study format as JSON Schema text (draft 2020-12), for editors. */
export function studyJsonSchema(): string {
  const schema = z.toJSONSchema(studySchema, { io: "input" }) as Record<string, unknown>;
  return `${JSON.stringify({ ...schema, $id: "https://ridgeline.invalid/schema/study.schema.json", title: "Ridgeline study" }, null, 2)}\n`;
}
