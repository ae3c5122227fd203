/**
 * The roster file's reading and the import plan, table-driven. Sources beside the checks:
 * CSV quoting — RFC 4180 (Shafranovich, IETF 2005) §2; UTF-8 validity — RFC 3629 (Yergeau,
 * IETF 2003) §3–4 and the WHATWG Encoding Standard's fatal decoder; Latin-1 "é" is the single
 * byte 0xE9 — ISO/IEC 8859-1:1998; bidi controls — Unicode Standard Annex #9 §2.
 */
import { describe, expect, it } from "vitest";
import { markInvisible, hasInvisible } from "./invisible";
import { columnLetter, parseRoster, ROSTER_MAX_BYTES, type RosterUnit } from "./parse";
import { planRoster, planKey, type CurrentPerson } from "./plan";

const UNITS: RosterUnit[] = [
  { id: "u-aicu", name: "Adult ICU", code: "AICU", active: true },
  { id: "u-old", name: "Old Wing", code: "OLD", active: false },
];
const bytes = (s: string) => new TextEncoder().encode(s);
const H = "employee_id,name,email,hire_date,title,unit,roles,active\n";
const row = (over: Partial<Record<"id" | "name" | "email" | "hire" | "title" | "unit" | "roles" | "active", string>> = {}) =>
  [over.id ?? "E-1", over.name ?? "Ada Quill", over.email ?? "ada@example.test", over.hire ?? "2026-01-05", over.title ?? "RT I", over.unit ?? "AICU", over.roles ?? "therapist", over.active ?? "yes"].join(",") + "\n";

describe("columnLetter", () => {
  it("counts like a spreadsheet (common practice, no source)", () => {
    expect([0, 1, 25, 26, 27, 701, 702].map(columnLetter)).toEqual(["A", "B", "Z", "AA", "AB", "ZZ", "AAA"]);
  });
});

describe("parseRoster", () => {
  it("reads a good file with a BOM, quoted commas, unit by code or name in any case, and roles by ';'", () => {
    const text = "\ufeff" + H + row() + '"E-2","Quill, Bo",BO@Example.test,2026-02-28,,adult icu,Therapist;preceptor;therapist,no\n\n';
    const parsed = parseRoster(bytes(text), UNITS);
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows).toEqual([
      { row: 2, employeeId: "E-1", name: "Ada Quill", email: "ada@example.test", hireDate: "2026-01-05", title: "RT I", homeUnitId: "u-aicu", roles: ["therapist"], active: true },
      // RFC 4180 §2.6: a quoted field may contain commas. E-mail lower-cased as the person form does.
      { row: 3, employeeId: "E-2", name: "Quill, Bo", email: "bo@example.test", hireDate: "2026-02-28", title: null, homeUnitId: "u-aicu", roles: ["therapist", "preceptor"], active: false },
    ]);
  });

  it("leaves optional columns the file does not have undefined (left as they are)", () => {
    const parsed = parseRoster(bytes("Employee ID,Name,E-mail,Hire Date\nE-1,Ada,ada@example.test,2026-01-05\n"), UNITS);
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows[0]).toEqual({ row: 2, employeeId: "E-1", name: "Ada", email: "ada@example.test", hireDate: "2026-01-05" });
  });

  const bad: [string, string | Uint8Array, { row: number | null; column: string | null; message: RegExp }][] = [
    ["empty", "", { row: null, column: null, message: /empty/ }],
    ["blank space only", "  \n\n", { row: null, column: null, message: /empty/ }],
    ["header only", H, { row: 2, column: "A", message: /no people/ }],
    ["missing columns", "employee_id,name\nE-1,Ada\n", { row: 1, column: "C", message: /Missing required columns: email, hire_date/ }],
    ["unknown column", "employee_id,name,email,hire_date,titel\n", { row: 1, column: "E (titel)", message: /Unknown column “titel”/ }],
    ["repeated column", "employee_id,name,email,hire_date,Name\n", { row: 1, column: "E (Name)", message: /appears twice/ }],
    ["impossible date", H + row({ hire: "2026-02-30" }), { row: 2, column: "D (hire_date)", message: /2026-02-30 is not a real date: February 2026 has 28 days/ }],
    ["day/month date", H + row({ hire: "12/03/2026" }), { row: 2, column: "D (hire_date)", message: /YYYY-MM-DD/ }],
    ["bad e-mail", H + row({ email: "ada(at)example" }), { row: 2, column: "C (email)", message: /full e-mail address/ }],
    ["empty employee id", H + row({ id: "" }), { row: 2, column: "A (employee_id)", message: /employee id is empty/ }],
    ["unknown unit", H + row({ unit: "Burns" }), { row: 2, column: "F (unit)", message: /no unit “Burns”/ }],
    ["inactive unit", H + row({ unit: "OLD" }), { row: 2, column: "F (unit)", message: /Old Wing is deactivated/ }],
    ["unknown role", H + row({ roles: "therapist;surgeon" }), { row: 2, column: "G (roles)", message: /Unknown role “surgeon”/ }],
    ["bad active", H + row({ active: "maybe" }), { row: 2, column: "H (active)", message: /yes or no/ }],
    ["duplicate employee id", H + row() + row({ email: "b@example.test" }), { row: 3, column: "A (employee_id)", message: /also on row 2/ }],
    ["duplicate e-mail", H + row() + row({ id: "E-2" }), { row: 3, column: "C (email)", message: /also on row 2/ }],
    ["too many cells", H + "E-1,Quill, Ada,ada@example.test,2026-01-05,RT,AICU,therapist,yes\n", { row: 2, column: "I", message: /9 cells but the header has 8/ }],
    ["too few cells", H + "E-1,Ada,ada@example.test\n", { row: 2, column: "D", message: /3 cells but the header has 8/ }],
    ["unterminated quote", H + row() + 'E-2,"Bo,bo@example.test,2026-01-05,,,,yes\n', { row: 3, column: "B", message: /never closed/ }],
    // ISO/IEC 8859-1 é = 0xE9; in UTF-8 (RFC 3629) 0xE9 must be followed by two continuation bytes.
    ["Latin-1 bytes", new Uint8Array([...bytes(H + row()), ...bytes("E-2,Ren"), 0xe9, ...bytes("e,r@example.test,2026-01-05,,,,yes\n")]), { row: 3, column: "B", message: /not UTF-8/ }],
    ["too large", new Uint8Array(ROSTER_MAX_BYTES + 1).fill(0x41), { row: null, column: null, message: /limit is 2 MB/ }],
  ];
  it.each(bad)("refuses %s with its row and column, and keeps no rows", (_, input, expected) => {
    const parsed = parseRoster(typeof input === "string" ? bytes(input) : input, UNITS);
    expect(parsed.rows).toEqual([]);
    expect(parsed.problems[0]).toMatchObject({ row: expected.row, column: expected.column });
    expect(parsed.problems[0].message).toMatch(expected.message);
  });

  it("keeps hostile cells verbatim apart from surrounding whitespace: formulas, markup, bidi and zero-width characters", () => {
    const name = '=HYPERLINK("http://attacker.example/","Click")';
    const title = "\u202eIIX tsipareht\u202c <script>x</script>";
    const parsed = parseRoster(bytes(`employee_id,name,email,hire_date,title\nE-1,"  ${name.replaceAll('"', '""')} ",a@example.test,2026-01-05,${title}\nE-2,+Ana\u200bLee,b@example.test,2026-01-05,@SUM(1)\n`), UNITS);
    expect(parsed.problems).toEqual([]);
    expect(parsed.rows.map((r) => [r.name, r.title])).toEqual([
      [name, title],
      ["+Ana\u200bLee", "@SUM(1)"],
    ]);
  });
});

describe("markInvisible", () => {
  it("marks zero-width and bidi controls as ⟨U+XXXX⟩ and leaves visible text, including Arabic, alone (UAX #9 §2)", () => {
    expect(markInvisible("Ana\u200bLee")).toEqual([
      { text: "Ana", invisible: false },
      { text: "⟨U+200B⟩", invisible: true },
      { text: "Lee", invisible: false },
    ]);
    expect(markInvisible("\u202eabc\u202c").map((p) => p.text).join("")).toBe("⟨U+202E⟩abc⟨U+202C⟩");
    expect(markInvisible("\u2066x\u2069\ufeff").map((p) => p.text).join("")).toBe("⟨U+2066⟩x⟨U+2069⟩⟨U+FEFF⟩");
    expect(hasInvisible("مريم الحسن <b>")).toBe(false);
    expect(hasInvisible("a\u00adb")).toBe(true);
  });
});

describe("planRoster", () => {
  const person = (over: Partial<CurrentPerson>): CurrentPerson => ({
    id: "p1", employeeId: "E-1", name: "Ada Quill", email: "ada@example.test", title: "RT I", hireDate: "2026-01-05", homeUnitId: "u-aicu", active: true, roles: ["therapist"], ...over,
  });
  const ctx = (people: CurrentPerson[], deactivateMissing = false, foreign: string[] = []) => ({
    people, foreignEmails: new Set(foreign), actorId: "admin", deactivateMissing, columnLabel: (c: string) => c,
  });
  const rows = (text: string) => {
    const parsed = parseRoster(bytes(H + text), UNITS);
    expect(parsed.problems).toEqual([]);
    return parsed.rows;
  };

  it("finds nothing to do when the people already match the file", () => {
    const plan = planRoster(rows(row()), ctx([person({})]));
    expect(plan).toMatchObject({ created: [], changed: [], deactivated: [], unchanged: 1, problems: [] });
  });

  it("sorts rows into new and changed (old → new) and only adds roles", () => {
    const plan = planRoster(rows(row({ title: "RT II", roles: "preceptor" }) + row({ id: "E-2", email: "b@example.test", name: "Bo" })), ctx([person({ roles: ["therapist", "admin"] })]));
    expect(plan.changed).toEqual([{ row: 2, personId: "p1", employeeId: "E-1", name: "Ada Quill", changes: { title: { before: "RT I", after: "RT II" } }, rolesAdded: ["preceptor"] }]);
    expect(plan.created.map((c) => c.employeeId)).toEqual(["E-2"]);
  });

  it("deactivates the missing only when asked, and never the importing admin, an admin or someone without an employee id", () => {
    const people = [
      person({}),
      person({ id: "p2", employeeId: "E-2", email: "2@x.test" }),
      person({ id: "admin", employeeId: "E-3", email: "3@x.test" }),
      person({ id: "p4", employeeId: "E-4", email: "4@x.test", roles: ["admin"] }),
      person({ id: "p5", employeeId: null, email: "5@x.test" }),
      person({ id: "p6", employeeId: "E-6", email: "6@x.test", active: false }),
    ];
    expect(planRoster(rows(row()), ctx(people)).deactivated).toEqual([]);
    expect(planRoster(rows(row()), ctx(people, true)).deactivated).toEqual([{ personId: "p2", employeeId: "E-2", name: "Ada Quill" }]);
  });

  it("refuses an e-mail someone else holds, here or in another organisation, and active=no for an admin", () => {
    const people = [person({}), person({ id: "p2", employeeId: "E-2", email: "b@example.test", name: "Bo", roles: ["admin"] })];
    const clash = planRoster(rows(row({ email: "b@example.test" })), ctx(people));
    expect(clash.problems[0]).toMatchObject({ row: 2, column: "email", message: expect.stringContaining("already belongs to Bo (employee id E-2)") });
    const foreign = planRoster(rows(row({ email: "else@other.test" })), ctx(people, false, ["else@other.test"]));
    expect(foreign.problems[0].message).toBe("else@other.test is already in use in Tidemark. Each person signs in with their own address.");
    const admin = planRoster(rows(row({ id: "E-2", email: "b@example.test", active: "no" })), ctx(people));
    expect(admin.problems[0]).toMatchObject({ row: 2, column: "active", message: expect.stringContaining("is an admin") });
  });

  it("gives the same key for the same plan and a different key when the people change", () => {
    const r = rows(row({ title: "RT II" }));
    expect(planKey(planRoster(r, ctx([person({})])))).toBe(planKey(planRoster(r, ctx([person({})]))));
    expect(planKey(planRoster(r, ctx([person({})])))).not.toBe(planKey(planRoster(r, ctx([person({ title: "RT III" })]))));
  });
});
