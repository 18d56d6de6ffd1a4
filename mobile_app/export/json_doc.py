"""# Boardside export format

An export is a **bundle**: one folder holding a job's record three ways plus a manifest. Bundles are
never overwritten; a second export of the same job revision gets a folder name of its own.

```
job12-ACME-4471-rev1-2026-12-02/
  job12-ACME-4471-rev1-2026-12-02.json   the complete job (described below); loads back into the app
  job12-ACME-4471-rev1-2026-12-02.csv    one row per circuit, for a spreadsheet
  job12-ACME-4471-rev1-2026-12-02.pdf    the printed record with the working of every circuit
  manifest.json                          the size and SHA-256 of each file above
```
The name is `job<id>-<client reference>-rev<revision>-<UTC date of export>`. A second export of the
same revision on the same day is named `...-2026-12-02-2`, then `-3`, up to `-999`. An export of one
board adds `-board-<designation>` before the date. A name is at most 64 characters of ASCII letters,
digits and `-`, so it fits every common file system and WebDAV server, also inside an office's synced
folder on Windows: the job id, revision, `board`, date and counter are kept whole and the client
reference and designation are shortened to fit; accents are dropped (`é` → `e`, `ß` → `ss`) and
letters of other scripts left out (the full text is in the files). File names add `.json`, `.csv`,
`.pdf` (at most 69 characters); on the office server the folder name gains `-` and 16 hex digits of
the bundle's hash (at most 81), so a path below the office folder is at most 151 characters.
Files are read-only. A bundle is written in a hidden work folder
(`.<name>.<random>.partial`) and moved under its name only when complete, so a bundle folder is never
half-written.

## manifest.json
```
{"schema": "boardside-bundle", "schema_version": 1, "name": "<folder name>",
 "job_id": 12, "revision": 1, "board_id": null, "exported_at": "2026-12-02T07:15:03+00:00",
 "calc_version": "0.1.0",
 "files": {"<file name>": {"sha256": "<64 lower-case hex digits>", "bytes": 12345}, ...},
 "cautions": ["...", "...", "..."], "approval_signature": "<128 hex digits, or null>"}
```
`files` lists the JSON, CSV and PDF files (not the manifest itself): `sha256` is the SHA-256 of the
file's bytes and `bytes` its size. `board_id` is the board's id in a one-board export, else `null`.
`approval_signature` repeats the signature of the job's approval (below), binding the manifest to
it; `verify` also checks that the CSV is the one the approved JSON gives.

## The JSON file
UTF-8, one line (not indented), numbers as JSON numbers (never NaN or Infinity), `null` where nothing is
known. `schema` is `"boardside-job"` and `schema_version` is 2. A reader refuses a document whose
`schema` differs or whose `schema_version` is greater than the one it knows.

Importing a JSON export loads the job back as it was, in one transaction (a document that cannot be
read imports nothing), under new ids: its status (an approved job stays approved and read-only), its
revision and `revision_reason`, who recorded, submitted and approved it and when, the review comment,
every field as typed, each circuit's assessment as exported with its `calc_version`, and the audit
trail, followed by one entry saying it was imported. People are matched to people in the store by name
and role, or added without a PIN (a document without `people` gives no roles: a name matches anyone of
that name, a newcomer is added as an apprentice, an approver as a supervisor). A draft circuit
assessed by another version of the calculation core is assessed again, and an audit entry records a
changed result; submitted and approved jobs keep their assessments. `parent_job_id` is linked only when
the store holds the previous revision (approved, same client reference, not yet revised); otherwise it
is `null` and `revision_reason` is kept. Library devices are reused when one of the same name and
points is already there. Instruments and observations come back in their order, an observation's
circuits mapped to the imported circuits.

### Versions and importing older exports
- **1** (exports before the whole test record): the job's supply, boards and circuits with their loop
  readings and assessments, review, people and audit trail.
- **2**: adds `instruments`, `observations` and `job.overall`; new job fields (`client_name`,
  `client_address`, `purpose`, `next_inspection`, `limitations`), board fields (`pfc`, `main_device`,
  `main_rating`, `origin`, `earthing_csa`, `bonding_csa`, `ra`) and circuit fields (the circuit's other
  tests, its wiring, length and points, breaking capacity, the RCD's type letter, a separate protective
  conductor's own insulation). One meaning changed: a device typed `rcbo` had `device_kind` value `mcb`
  in version 1 and has `rcbo` (a breaker and an RCD in one device) in version 2.

A version 1 document is imported by first bringing it to version 2: empty `instruments` and
`observations`, the new fields blank, every field kept as typed (and parsed again from its `raw`
text, so a device typed `rcbo` becomes an RCBO, which needs its RCD's IΔn when a draft is assessed
again); the overall outcome is worked out again from the circuits when the job is next exported. The
verdict word `incomplete` of version 1 exports reads as `not-shown`.

A document that cannot be imported is refused before anything is written, with one line naming the
place that is wrong, e.g. `not a readable job document: boards[0].circuits[3].fields.zs.raw: must be
text, a number or null, not a list`. Limits: at most 32 MB of UTF-8 JSON; objects and lists nested at
most 24 deep; text at most 20 000 characters; keys at most 200; lists at most 100 000 items; numbers
finite and at most 10^15 in size. Keys the reader does not know are allowed and ignored.

### Top level
- `schema`: always `"boardside-job"`.
- `schema_version`: 1 for this layout; raised when a key changes meaning or goes away.
- `calc_version`: version of the calculation core in the app at export time.
- `exported_at`: when the document was made, ISO-8601 with UTC offset.
- `cautions`: the cautions that go with every result (a list of sentences).
- `job`: the job (below).
- `boards`: the job's boards, each with its circuits (only one board in a one-board export).
- `instruments`: the test instruments used, in order.
- `observations`: what the inspection found, in order.
- `library_devices`: manufacturer time–current curves used by the job's circuits.
- `people`: the people the job, its circuits and its audit trail refer to.
- `audit`: every recorded change to the job, oldest first.
- `approval`: the supervisor's signed approval of this revision (below), or `null` if not approved.
- `roster_entry`: the approver's roster entry, signed by the firm (below), or `null` for a supervisor
  the office did not enrol (such an approval is *unverified*).

### `approval` and `roster_entry`: what makes an approval verifiable
An approval is an Ed25519 signature (RFC 8032) by the supervisor's key over the canonical JSON of
`{"schema": "boardside-approval", "schema_version": 1, "document_sha256", "parts", "revision",
"supervisor", "public_key", "approved_at", "audit_head"}`; `signature` (128 hex digits) is added
beside them. `parts` maps each part of the document to the SHA-256 of its canonical JSON:
`job` (the job without `id`, `status`, `parent_job_id`, `approved_by`, `approved_at` and `overall`),
`boards/<i>` (board i without `id` and `circuits`), `boards/<i>/circuits/<j>` (circuit j without `id`,
its `updated_by` as a name, its `library_device_id` field replaced by `library_device`, the device's
`name`, `rating_a` and `points`), and `instruments/<i>` and `observations/<i>` (without `id` and
`circuit_ids`; an observation's circuits count by their labels); `document_sha256` is the SHA-256 of
the canonical JSON of `parts`. A field added in version 2 counts only when it holds something (raw
text, a value or an error): left blank it is hashed as if absent, so approvals signed before version 2
still hold.
Ids, `exported_at`, `cautions`, `calc_version` at the top, `people` and `audit` are not covered;
`audit_head` is the hash of the device's audit chain when the job was approved.

Canonical JSON: keys sorted by Unicode code point at every level; no whitespace outside strings
(`,` and `:` only); text as UTF-8, not escaped except the quote, the backslash and control
characters; numbers as Python's `json` writes them (integers in decimal, floats as the shortest text
that reads back to the same double, e.g. `0.62`, `1e-05`, `2.0`); no NaN or infinity. It is not
RFC 8785: a float keeps its `.0`.

`roster_entry` is `{"schema": "boardside-roster-entry", "schema_version": 1, "name", "public_key",
"valid_from", "valid_to", "firm_key", "signature"}`, the firm's signature over the canonical JSON of
the other keys. `python -m mobile_app verify BUNDLE --office OFFICE_DIR` checks the manifest, every
part, the signature and the entry against the firm key; an import keeps `approved` only when the
same checks hold against the firm key pinned on the device.

### A field: `{"raw", "value", "error"}`
Every reading and setting is kept exactly as typed beside what it means:
- `raw`: the text as typed (`"620 mΩ"`), or `null` if nothing was typed;
- `value`: the parsed value in base units (a number in Ω, A, V, s, mm², °C or A²s; a canonical word
  for a choice, e.g. `"TN-C-S"` for `"tncs"`; `null` when blank or unusable);
- `error`: why the text could not be used (`null` when it could).

### `job`
- `id`: the job's number in the store it came from (an import gives a new number).
- `revision`: 1 for the first record; a change after approval opens the next revision.
- `status`: `draft`, `submitted` (for review) or `approved` (locked).
- `parent_job_id`, `revision_reason`: the job this revision was opened from and why (`null` for a
  first revision).
- `client_ref`, `site_address`, `description`, `date`, `system`: as typed (repeated from `fields`).
- `fields`: each job field as a field: `client_ref` (the job reference), `client_name`,
  `client_address`, `site_address`, `description`, `date`, `purpose` (`new-work`, `periodic` or
  `fault-finding`), `next_inspection` (a date, for periodic work), `limitations` (what the inspection
  could not cover, as written), `system` (`TN-S`, `TN-C-S` or `TT`), `u0` (V), `cmin` (voltage factor,
  no unit), `ze` (Ω, at the origin), `pfc` (A, prospective fault current at the origin).
- `recorded_by`, `recorded_at`: the name of who created the job, and when.
- `submitted_by`, `submitted_at`: the name of who submitted it for review and when (`null` if not
  submitted).
- `approved_by`, `approved_at`: the supervisor who approved it and when (`null` until approved).
- `review_comment`: the reviewer's comment when the job was returned to draft, else `null`.
- `approval_reasons`: what the supervisor approved the job with and why: one entry for each failing
  circuit, circuit not shown to pass, board with no circuit and open observation at approval, each
  with `item` (its kind and number here: `circuit:12`, `board:3`, `observation:5`), `what` (it in
  words) and `reason` (as written); empty for a job approved with nothing open. Covered by the
  approval's signature when not empty.
- `overall`: the job's overall outcome when exported: `outcome` (`satisfactory` when every circuit
  passes and no observation is serious; `unsatisfactory` when a circuit fails or an observation is
  serious; `not-shown` while anything is undecided) and `reasons` (sentences, the deciding ones first).

### `boards[]`
- `id`: the board's number in the store it came from.
- `designation`, `location`, `supplied_from`: as typed.
- `fields`: each board field as a field: `designation`, `location`, `supplied_from`, `system`, `ze`
  (Ω, Ze or Zdb measured at this board) and `pfc` (A, prospective fault current at this board) — blank
  means the job's supply —, `ra` (Ω, a TT earth electrode's resistance), `main_device` (the main switch
  or device, as written) and `main_rating` (A), `origin` (`yes` for the board at the origin), and at
  the origin `earthing_csa` and `bonding_csa` (mm², the earthing conductor and the main protective
  bonding conductors).
- `circuits`: the board's circuits, in order.

### `boards[].circuits[]`
- `id`: the circuit's number in the store it came from.
- `number`, `description`: as typed.
- `fields`: each circuit field as a field. Yes-or-no fields have the value `yes` or `no`; a reading
  beyond the instrument's range keeps its bound as text in base units (`">999"` MΩ, `">0.3"` s).
  - the circuit: `number` (its reference as typed: `3`, `L2-4`), `description`, `points_served` (a
    whole number), `role` (`final` or `distribution`), `wiring_type` and `reference_method` (as
    written), `length_m` (m), `ring` (a ring final circuit), `selv`;
  - its protection: `device_kind` (`mcb`, `rcbo`, `fuse-gg` or `curve`), `device_curve` (`B`, `C`,
    `D`), `device_rating` (A), `breaking_capacity` (A), `library_device_id` (an id in
    `library_devices`), `let_through_i2t` (A²s) and `let_through_at` (A, the prospective current the
    maker states it at), `rcd_idn` (A), `rcd_type` (`general` or `s`, time-delayed), `rcd_waveform`
    (the RCD's type letter: `AC`, `A`, `F` or `B`), `rcd_additional` (an RCD for additional protection);
  - its conductors: `line_csa` (mm²), `line_material`, `line_insulation`, `cpc_csa` (mm²),
    `cpc_material`, `cpc_arrangement` (`in-cable`, `separate` or `armour`), and for a separate one
    `cpc_insulation`, `cpc_bunched` (with other cables) and `cpc_protected` (mechanically);
  - its readings and tests: `zs`, `zsc`, `r1r2`, `ze` (Ω), `test_temp_c` (°C), `r2` (Ω), `ring_r1`,
    `ring_rn`, `ring_r2` (Ω, end to end), `insulation_test_voltage` (V), `insulation_line_line` and
    `insulation_line_earth` (MΩ), `polarity` (`yes`: correct), `rcd_time_1x` and `rcd_time_5x` (s, at
    IΔn and 5 IΔn), `rcd_test_button` (`yes`: the RCD tripped on its test button).
- `verdict`: `pass`, `fail` or `not-shown` (`null` before the first assessment; exports of calc 0.1 wrote
  `incomplete`, read on import as `not-shown`).
- `assessment`: the calculation core's output (below), or `null`.
- `calc_version`: version of the calculation core that made this assessment.
- `assessment_error`: why the core could not assess the circuit (verdict `not-shown`), else `null`.
- `updated_at`, `updated_by`: when the circuit last changed, and the id of the person who changed it
  (their name and role are in `people`).

### `assessment`
The calculation core's output as it made it; a value's name carries its unit: - `verdict`, `reasons`:
the overall verdict (`pass` only when every check passes, `fail` when one fails on evidence, else
`not-shown`) and the checks that did not pass (`"Disconnection: fail"`). - `checks`: every check with
its `outcome` (`pass`, `fail`, `not-shown`), `ok`, the deciding `figure` and the `limit` it was held
against with their `unit`, `relation` (`≤` or `≥`), `margin_pct`, `margin` and `deciding` (the same
words on every surface), `why`, `needs` (what would decide a check not shown), `source`, `follows_from`,
`current_a` and `time_s` (what the check used), `id` and `title`. - `primary_cause`: the one check to
read first: `check`, `outcome`, `text`, `remedies`, `follows`. - `plausibility`: notes on valid but
unusual readings. - `calc_version`, `inputs`: the core's version and the normalised inputs it worked
from. - `device`: the protective device in short (`"B32"`). - `zs_ohm`, `zs_source`: the Zs used (Ω) and
where it came from (`"measured"` or `"Ze + (R1+R2)"`). - `earth_fault_current_a`: If = U0·Cmin/Zs (A);
`short_circuit_current_a`: Isc = U0·Cmin/Zsc (A). - `max_disconnection_time_s`: the time the rules allow
for this circuit (s). - `device_time_s`, `device_time_at_short_circuit_s`: the device's operating time
at If and at Isc (s). - `rcd_time_s`, `disconnection_time_s`: the RCD's time, and the time that clears
the fault (s). - `zs_max_ohm`: the largest Zs that still meets the allowed time (Ω);
`zs_limit_at_test_temp_ohm`: that limit corrected to the test temperature (Ω); `zs_rule_of_thumb_ohm`:
0.8 × Zs max (Ω, published guidance, a sufficient check only); `zs_margin_ok`: the reading meets the
limit at operating temperature (`null` when not shown). - `disconnection_ok`, `earth_path_ok`,
`breaking_capacity_ok`, `line_withstand_ok`, `line_withstand_max_ok`, `line_withstand_min_ok`, `cpc_ok`,
`cpc_adiabatic_ok`, `touch_voltage_ok`, `insulation_ok`, `continuity_ok`, `ring_ok`, `polarity_ok`,
`rcd_time_ok`, `rcd_button_ok`: each check's outcome (`true`, `false`, or `null` when it is not shown).
- `zs_limit_ohm` (the largest Zs the device or the RCD allows, Ω), `zs_at_operating_temp_ohm`,
`insulation_min_mohm` (MΩ), `expected_r1r2_ohm`, `ring_expected_r1r2_ohm` (Ω), `rcd_time_limit_1x_s`,
`rcd_time_limit_5x_s` (s): the figures of the newer checks. - `touch_voltage_v`: RA·IΔn for a TT circuit
relying on an RCD (V). - `k_line`, `k_cpc`: k of the line and protective conductors (A·s½/mm²). -
`line_withstand_time_s`: t = k²S²/I², how long the line conductor survives the fault (s). -
`cpc_proportional_min_mm2`: the protective conductor the proportional-size rule asks for (mm²);
`cpc_by_proportional_rule`: whether the rule was met. - `cpc_min_csa_mm2`: S = √(I²t)/k, the smallest
protective conductor that survives the fault (mm²). - `cautions`: the cautions, as the core gives them.
- `steps`: the working in walk order, each with `id`, `title`, `formula`, `working` (the formula with
the numbers), `value`, `unit`, `verdict` (`pass`, `fail`, `not-shown` or `info`), `note`.

Keys the core adds in a later version are kept as they are.

### `instruments[]`
- `id`: the instrument's number in the store it came from; `number`: its place in the list (1, 2, …).
- `fields`: `name` (the instrument, as written), `serial`, `calibration_date` (a date).
- `updated_at`: when it last changed.

### `observations[]`
- `id`, `number`, `updated_at`: as for instruments.
- `fields`: `finding` (what was found, as written), `severity` (`serious`: unsafe now or likely to
  become so; `attention`: to be put right; `note`: for the client's information), `location`.
- `circuit_ids`: the ids (in `boards[].circuits[]`) of the circuits it concerns; `circuits`: the same
  as labels, `"<board designation> / <circuit number>"`.

### `library_devices[]`
`id`, `name`, `rating_a` (A), `points`: a list of `[current_a, time_s]`, time falling as current rises.

### `people[]`
`id` (the person's number in the store the job came from), `name`, `role` (`apprentice`, `qualified`
or `supervisor`). Never a PIN.

### `audit[]`
`id`, `when` (ISO-8601), `person_id` and `who` (the person's id and name), `entity` (`job`, `board`,
`circuit`, `instrument`, `observation` or `review`) and `entity_id`, `label` (the board's or circuit's
designation), `what` (in words), `field`, `old` and `new` (the value before and after, as typed).

## The CSV file
UTF-8 with a byte-order mark (so spreadsheets pick the encoding), comma-separated, CRLF line ends, one
header row, then one row per circuit, board by board. The columns are those of the PDF's schedule of
test results, one value per column, rounded the same way and with the unit in the header: `Board`,
`Circuit` (the reference as typed), `Description`, `Ring or SELV`, `Points`, `Wiring`, `Reference
method`, `Length (m)`, `Device` (`RCBO B32`, `gG 32 A`, `curve 100 A`), `Maker's curve` (its name),
`Breaking capacity (kA)`, `RCD type` (the type letter, and `type S (delayed)`), `RCD IΔn (mA)`, `Line
(mm²)`, `Protective conductor (mm²)`, `R1+R2 (Ω)`, `R2 (Ω)`, `Ring r1 (Ω)`, `Ring rn (Ω)`, `Ring r2
(Ω)`, `Ring (r1 + r2)/4 (Ω)`, `Insulation test voltage (V)`, `Insulation L–L (MΩ)`, `Insulation L–E
(MΩ)`, `Polarity` (`correct` or `wrong`), `Zs (Ω)`, `Zs from` (`measured`, or how it was worked out),
`Zs limit (Ω)`, `Zs limit set by` (`device` or `RCD`), `RCD time at IΔn (ms)`, `RCD time at 5 IΔn (ms)`,
`RCD test button` (`trips` or `does not trip`), `Outcome` (`PASS`, `FAIL`, `NOT SHOWN`) and `Reason`
(the primary cause in words, for an outcome other than a pass). Then, for every check the calculation
core makes, its outcome, deciding figure and margin (`Disconnection: outcome`, …); then `Verdict` (the
word as stored), `Job`, `Client reference`, `Revision`, `Status`, `Calc version`, `Updated at` (local
time), `Updated by`, `Input problems` (any reading that could not be used, with the text as typed) and
`Cautions`.

Readings are rounded to three significant figures, as an installation tester shows them (at most two
decimals; RCD times in whole milliseconds); a reading beyond the instrument's range keeps its `>`
(`>999`). The JSON keeps every value at full precision. An empty cell means nothing was recorded. Any
text cell that starts with `=`, `+`, `-`, `@`, a tab or a carriage return and is not a number gets a
leading apostrophe `'`, so that no spreadsheet runs it as a formula.

## The PDF file
A4, DejaVu Sans embedded (its licence is in mobile_app/fonts). First the job: its reference, client,
site, purpose, dates, the overall outcome in short, the supply at the origin, the count of outcomes and
the cautions. Then, for each board on landscape pages, its schedule of test results: one row per
circuit, grouped as the work is done — the circuit (reference, description, ring or SELV, points,
wiring, reference method, length, line and protective conductor sizes), its protection (device, breaking
capacity, RCD type and IΔn), the tests with the supply off (continuity: R1+R2, R2 or the ring's r1, rn,
r2 and (r1 + r2)/4; insulation line to line and line to earth at its test voltage; polarity), the live
tests (Zs and its limit; RCD times at IΔn and 5 IΔn and its test button) and the outcome with its reason
in words — followed by a legend and the board's details. Then the observations (number, severity,
location, circuits, finding), the limitations of the inspection, the test instruments, the overall
outcome with every reason, and the people: who recorded, submitted and approved the record, their roles
and the date and time of each act (local time). Figures in the schedule are rounded as in the CSV. Last,
the calculation annex: the working of every circuit at full precision (each check and each step's result
and verdict, its formula and the numbers, its note) and the cautions again. A record that is not
approved carries a watermark across every page (`DRAFT · NOT APPROVED`, `IN REVIEW · NOT APPROVED`).
Every page's footer carries the cautions and `page n of N`."""

from __future__ import annotations

import json
from typing import Any

from mobile_app.export.common import CAUTIONS
from mobile_app.export.json_load import parse_document
from mobile_app.store.documents import DOCUMENT_SCHEMA, DOCUMENT_SCHEMA_VERSION
from mobile_app.store.errors import DocumentError

SCHEMA = DOCUMENT_SCHEMA
SCHEMA_VERSION = DOCUMENT_SCHEMA_VERSION


def check_document(doc: Any) -> dict[str, Any]:
    """Return `doc` if it is a boardside-job document of a version this code reads; DocumentError if not."""
    if not isinstance(doc, dict):
        raise DocumentError("a job document must be a JSON object")
    if doc.get("schema") != SCHEMA:
        raise DocumentError(f"schema is {doc.get('schema')!r}, not {SCHEMA!r}")
    version = doc.get("schema_version")
    if not isinstance(version, int) or isinstance(version, bool) or not 1 <= version <= SCHEMA_VERSION:
        raise DocumentError(
            f"schema_version {version!r} is not one this version reads (1 to {SCHEMA_VERSION})"
        )
    if not isinstance(doc.get("job"), dict) or not isinstance(doc.get("boards"), list):
        raise DocumentError("a job document needs a 'job' object and a 'boards' list")
    return doc


def with_cautions(doc: dict[str, Any]) -> dict[str, Any]:
    """A copy of `doc` (top level only) that carries the cautions, placed after `exported_at`."""
    if doc.get("cautions"):
        return dict(doc)
    result: dict[str, Any] = {}
    for key, value in doc.items():
        result[key] = value
        if key == "exported_at":
            result["cautions"] = list(CAUTIONS)
    result.setdefault("cautions", list(CAUTIONS))
    return result


def job_json_bytes(doc: dict[str, Any]) -> bytes:
    """The JSON file of a job document: UTF-8 on one line, with the cautions; DocumentError if not JSON-able.

    Not indented: Python's indenting encoder is several times slower than its compact one.
    """
    checked = with_cautions(check_document(doc))
    try:
        text = json.dumps(checked, ensure_ascii=False, allow_nan=False)
    except (TypeError, ValueError) as error:
        raise DocumentError(f"the job document cannot be written as JSON: {error}") from error
    return (text + "\n").encode("utf-8")


def load_job_json(data: bytes | str) -> dict[str, Any]:
    """Read a JSON export back into a job document, checking its schema; DocumentError if unusable
    (over the size limit, not JSON, too dense or too deep: see `json_load`)."""
    return check_document(parse_document(data))


def import_job_json(store: Any, data: bytes | str) -> int:
    """Load a JSON export into `store` as it was exported (`store.documents.import_`); the new job's id."""
    return int(store.documents.import_(load_job_json(data)))
