// Hostile and malformed URDF files: each is refused with a UrdfError whose one-line message names
// the element (the API answers it as a 400, the command line as one stderr line), never with another
// exception and never by hanging. Timings of these files are printed by `npm run bench`.
import { readFileSync } from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { exportUrdf, importUrdf, UrdfError, URDF_LIMITS } from "@/lib/urdf";
import { armSchema } from "@/shared/schemas";

const slanted = readFileSync(path.join(__dirname, "../reference/urdf/slanted-six.urdf"), "utf8");
const robot = (body: string) => `<?xml version="1.0"?>\n<robot name="r">\n${body}\n</robot>\n`;
const rev = (name: string, parent: string, child: string) =>
  `<joint name="${name}" type="revolute"><parent link="${parent}"/><child link="${child}"/><axis xyz="0 0 1"/><limit lower="-1" upper="1" effort="1" velocity="1"/></joint>`;

function refusal(text: string): UrdfError {
  try {
    importUrdf(text);
  } catch (e) {
    expect(e).toBeInstanceOf(UrdfError);
    const err = e as UrdfError;
    expect(err.message).not.toMatch(/\n/);
    expect(err.element.length).toBeGreaterThan(0);
    return err;
  }
  throw new Error("the file was accepted");
}

const laughs = `<?xml version="1.0"?>
<!DOCTYPE robot [
  <!ENTITY lol "lol">
  <!ENTITY lol1 "&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;">
  <!ENTITY lol2 "&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;">
  <!ENTITY lol3 "&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;">
  <!ENTITY lol9 "&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;">
]>
<robot name="&lol9;"><link name="a"/></robot>`;

const CASES: [string, string, RegExp][] = [
  ["entity expansion (billion laughs)", laughs, /^<!DOCTYPE> \(line 2\): DOCTYPE and entity declarations are refused/],
  ["external entity", `<?xml version="1.0"?><!DOCTYPE r [<!ENTITY x SYSTEM "file:///etc/passwd">]><robot name="&x;"/>`, /^<!DOCTYPE> \(line 1\)/],
  ["a plain DOCTYPE", `<!DOCTYPE robot>\n${robot('<link name="a"/>')}`, /^<!DOCTYPE>/],
  ["an ENTITY without DOCTYPE", `${robot('<link name="a"/>')}<!ENTITY x "y">`, /^<!ENTITY>/],
  ["20 MB", `<robot name="big">${" ".repeat(20 * 1024 * 1024)}</robot>`, /^file: is more than 2 097 152 bytes|^file: is more than 2,097,152 bytes; the limit is 2 MiB/],
  ["10 000 joints", robot(Array.from({ length: 10_000 }, (_, i) => `<joint name="j${i}" type="fixed"><parent link="a"/><child link="b${i}"/></joint>`).join("")), /^<joint>: the file has more than 400 joint elements/],
  ["201 links", robot(Array.from({ length: 201 }, (_, i) => `<link name="l${i}"/>`).join("")), /^<link>: the file has more than 200 links/],
  ["a cycle", robot(`<link name="a"/><link name="b"/><link name="c"/><link name="root"/>${rev("ab", "a", "b")}${rev("bc", "b", "c")}${rev("ca", "c", "a")}`), /closes a cycle through joints/],
  ["a joint to itself", robot(`<link name="a"/>${rev("self", "a", "a")}`), /^joint "self": connects link "a" to itself/],
  ["a missing parent link", robot(`<link name="b"/>${rev("j", "ghost", "b")}`), /^joint "j" <parent>: link "ghost" does not exist/],
  ["a missing child link", robot(`<link name="a"/>${rev("j", "a", "ghost")}`), /^joint "j" <child>: link "ghost" does not exist/],
  ["two roots", robot(`<link name="a"/><link name="b"/><link name="c"/>${rev("j", "a", "b")}`), /^link "c": the description has 2 root links \("a", "c"\)/],
  ["a link with two parents", robot(`<link name="a"/><link name="b"/><link name="c"/>${rev("j1", "a", "c")}${rev("j2", "b", "c")}`), /^link "c": is the child of two joints, "j1" and "j2"/],
  ["a duplicate link", robot(`<link name="a"/><link name="a"/>`), /^link "a": is defined twice/],
  ["a duplicate joint", robot(`<link name="a"/><link name="b"/><link name="c"/>${rev("j", "a", "b")}${rev("j", "b", "c")}`), /^joint "j": is defined twice/],
  ["a mimic joint", robot(`<link name="a"/><link name="b"/><joint name="m" type="revolute"><parent link="a"/><child link="b"/><limit lower="-1" upper="1" effort="1" velocity="1"/><mimic joint="other"/></joint>`), /^joint "m" <mimic>: the joint follows joint "other"/],
  ["a floating joint", robot(`<link name="a"/><link name="b"/><joint name="f" type="floating"><parent link="a"/><child link="b"/></joint>`), /^joint "f": is a floating joint/],
  ["a planar joint", robot(`<link name="a"/><link name="b"/><joint name="p" type="planar"><parent link="a"/><child link="b"/></joint>`), /^joint "p": is a planar joint/],
  ["NaN in a number", robot(`<link name="a"/><link name="b"/><joint name="j" type="fixed"><origin xyz="0 NaN 0"/><parent link="a"/><child link="b"/></joint>`), /^joint "j" <origin> xyz: "NaN" is not a number/],
  ["text in a number", robot(`<link name="a"/><link name="b"/><joint name="j" type="revolute"><parent link="a"/><child link="b"/><limit lower="abc" upper="1" effort="1" velocity="1"/></joint>`), /^joint "j" <limit> lower: "abc" is not a number/],
  ["an infinite number", robot(`<link name="a"><inertial><mass value="1e999"/></inertial></link>`), /^link "a" <inertial> <mass> value: "1e999" is not a finite number/],
  ["two numbers for three", robot(`<link name="a"/><link name="b"/>${rev("j", "a", "b").replace('<axis xyz="0 0 1"/>', '<axis xyz="0 1"/>')}`), /^joint "j" <axis> xyz: "0 1" must be 3 numbers/],
  ["a 60 000-digit number", robot(`<link name="a"><inertial><mass value="${"1".repeat(60_000)}x"/></inertial></link>`), /^link "a" <inertial> <mass> value: "1111111111111111111111111111111111111111…" is not a number/],
  ["a 60 KiB attribute", robot(`<link name="${"x".repeat(60_000)}"/>`), /^base link "x{40}…": has no moving joint below it/],
  ["5000 attributes on one element", robot(`<link name="a" ${Array.from({ length: 5000 }, (_, i) => `x${i}="1"`).join(" ")}/>`), /^file \(line 3\): an element has 5001 attributes/],
  ["16 000 comments", robot(`<link name="a"/>${"<!-- c -->".repeat(16_000)}`), /^file: has more than 15,000 tags and comments/],
  ["16 000 processing instructions", robot(`<link name="a"/>${"<?p x?>".repeat(16_000)}`), /^file: has more than 15,000 tags and comments/],
  ["a negative mass", robot(`<link name="a"><inertial><mass value="-2"/></inertial></link>`), /^link "a" <inertial> <mass> value: -2 must be ≥ 0/],
  ["a zero-size box", robot(`<link name="a"><collision><geometry><box size="0 1 1"/></geometry></collision></link>`), /^link "a" <collision> 1 <box> size: 0 must be > 0/],
  ["an empty file", "", /^file: is empty/],
  ["only spaces", "  \n\t ", /^file: is empty/],
  ["not XML at all", "solid mesh\nfacet normal 0 0 1\n", /^file \(line 1, column 1\): is not well-formed XML/],
  ["JSON", JSON.stringify({ name: "arm", convention: "dh", joints: [] }), /^file \(line 1, column 1\): is not well-formed XML/],
  ["truncated XML", slanted.slice(0, 900), /^file \(line \d+, column \d+\): is not well-formed XML/],
  ["another root element", `<?xml version="1.0"?><sdf version="1.6"><model name="x"/></sdf>`, /^<sdf>: the root element must be <robot>/],
  ["no links", robot(""), /^<robot>: has no <link>/],
  ["deep nesting", robot(`<link name="a">${"<x>".repeat(1000)}${"</x>".repeat(1000)}</link>`), /^file: elements are nested more than 32 deep/],
  ["a long text run", robot(`<link name="a">${"x".repeat(70_000)}</link>`), /^file \(line 3\): has more than 64 KiB of text without markup/],
  ["a 1 MB comment", robot(`<link name="a"/><!-- ${"<x>".repeat(350_000)} -->`), /^file \(line 3\): has more than 64 KiB of text without markup/],
  ["a xacro file", `<?xml version="1.0"?><robot name="x" xmlns:xacro="http://www.ros.org/wiki/xacro"><xacro:property name="l" value="1"/></robot>`, /^"xmlns:xacro" \(line 1\): this is a xacro file: macros are not expanded here; expand it first/],
  ["a xacro substitution", robot(`<link name="a"><inertial><mass value="\${m}"/></inertial></link>`), /^"\$\{" \(line 3\): this is a xacro file/],
  ["a revolute joint without limit", robot(`<link name="a"/><link name="b"/><joint name="j" type="revolute"><parent link="a"/><child link="b"/></joint>`), /^joint "j" <limit>: is required for a revolute joint/],
  ["an unknown joint type", robot(`<link name="a"/><link name="b"/><joint name="j" type="hinge"><parent link="a"/><child link="b"/></joint>`), /^joint "j" type: "hinge" is not a URDF joint type/],
  ["a joint without parent", robot(`<link name="a"/><link name="b"/><joint name="j" type="fixed"><child link="b"/></joint>`), /^joint "j" <parent>: is required/],
  ["two origins", robot(`<link name="a"/><link name="b"/><joint name="j" type="fixed"><origin/><origin/><parent link="a"/><child link="b"/></joint>`), /^joint "j" <origin>: appears 2 times; at most once/],
  ["a link without name", robot(`<link/>`), /^<link> name: is required/],
  ["no moving joint", robot(`<link name="a"/><link name="b"/><joint name="j" type="fixed"><parent link="a"/><child link="b"/></joint>`), /^base link "a": has no moving joint below it/],
];

describe("hostile and malformed URDF files are refused naming the element", () => {
  it("the size limit is 2 MiB", () => {
    expect(URDF_LIMITS.bytes).toBe(2 * 1024 * 1024);
    expect(URDF_LIMITS.links).toBe(200);
  });

  it.each(CASES)("%s", (_label, text, message) => {
    expect(refusal(text).message).toMatch(message);
  });

  it("element names like __proto__ are refused and do not reach object prototypes", () => {
    const text = robot(`<link name="a"><__proto__ polluted="yes"/></link><link name="b"/>${rev("j", "a", "b")}`);
    expect(refusal(text).message).toMatch(/^file: cannot be read as XML: .*__proto__/);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    const ctor = robot(`<link name="a"><constructor x="1"/></link><link name="b"/>${rev("j", "a", "b")}`);
    expect(refusal(ctor).message).toMatch(/constructor/);
  });
});

describe("random corruptions of a valid file (property test)", () => {
  const base = exportUrdf(importUrdf(slanted).arm);
  const lines = base.split("\n");
  const junk = ["NaN", "abc", "1e999", "", "--1", "0x10", "Infinity", "1,5", "&amp;", "<", "\"", "1 2 3 4"];
  const corruption = fc.oneof(
    // a number replaced by junk
    fc.tuple(fc.nat(), fc.constantFrom(...junk)).map(([k, j]) => {
      const nums = [...base.matchAll(/-?\d+(\.\d+)?(e-?\d+)?/g)];
      const m = nums[k % nums.length];
      return base.slice(0, m.index) + j + base.slice(m.index! + m[0].length);
    }),
    // a line deleted or duplicated
    fc.tuple(fc.nat(), fc.boolean()).map(([k, dup]) => {
      const i = k % lines.length;
      return [...lines.slice(0, i), ...(dup ? [lines[i], lines[i]] : []), ...lines.slice(i + 1)].join("\n");
    }),
    // truncated
    fc.nat().map((k) => base.slice(0, k % base.length)),
    // a random character inserted
    fc.tuple(fc.nat(), fc.constantFrom("<", ">", "&", "\"", "/", "=", "\u0000", "é")).map(([k, c]) => base.slice(0, k % base.length) + c + base.slice(k % base.length)),
    // two link names swapped in one place
    fc.nat().map((k) => {
      const refs = [...base.matchAll(/link="([^"]+)"/g)];
      const m = refs[k % refs.length];
      return base.slice(0, m.index) + `link="${m[1] === "link_1" ? "link_3" : "link_1"}"` + base.slice(m.index! + m[0].length);
    }),
  );

  it("either imports a valid arm or throws a one-line UrdfError naming the element", () => {
    fc.assert(
      fc.property(corruption, (text) => {
        let result;
        try {
          result = importUrdf(text);
        } catch (e) {
          if (!(e instanceof UrdfError)) throw e;
          expect(e.message).not.toMatch(/\n/);
          expect(e.element.length).toBeGreaterThan(0);
          return;
        }
        expect(armSchema.safeParse(result.arm).success).toBe(true);
      }),
      { numRuns: 400, seed: 1202 },
    );
  });
});
