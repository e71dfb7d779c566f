// The field descriptions the page reads (forms.json), for the tests: from the file named by
// DRIFTDOSE_FORMS (the pytest wiring writes it), or from the Python package in the source tree.
import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { schemaFrom } from "../../site/js/intake.js";

const root = join(dirname(fileURLToPath(import.meta.url)), "..", "..");

function loadForms() {
  if (process.env.DRIFTDOSE_FORMS) return JSON.parse(readFileSync(process.env.DRIFTDOSE_FORMS, "utf8"));
  const code = "import json, sys; sys.path.insert(0, sys.argv[1]); from driftdose import api; print(json.dumps(api.describe()))";
  for (const python of [join(root, ".venv", "bin", "python"), "python3"]) {
    try {
      return JSON.parse(execFileSync(python, ["-c", code, join(root, "pycore")], { encoding: "utf8", maxBuffer: 64 << 20 }));
    } catch {
      // try the next interpreter
    }
  }
  throw new Error("no forms description: set DRIFTDOSE_FORMS or create .venv");
}

export const FORMS = loadForms();
export const PANELS = [{ id: "motion" }, { id: "deposition" }, { id: "sampling" }];
// the survey entries of the record, read from site/js/survey.js (a DOM module, not imported here)
const surveySource = readFileSync(join(root, "site", "js", "survey.js"), "utf8");
const surveyBlock = surveySource.slice(surveySource.indexOf("SURVEY_FIELDS = ["), surveySource.indexOf("];", surveySource.indexOf("SURVEY_FIELDS = [")));
export const SURVEY = [...surveyBlock.matchAll(/\["([a-z_]+)",/g)].map((m) => m[1]);
if (SURVEY.length < 5) throw new Error("survey entries not found in site/js/survey.js");
export const SCHEMA = schemaFrom(FORMS, PANELS, { survey: SURVEY });
