// Request bodies: JSON only (415 for form, plain-text and untyped bodies) and the 1 MiB cap on a
// streamed body without a declared length.
import { describe, expect, it } from "vitest";
import { sampleArm } from "../db/helpers";
import * as arms from "@/app/api/arms/route";
import { call, type Body } from "./client";
import { withAccounts } from "./setup";

const { acc } = withAccounts();

describe("request bodies must be sent as JSON", () => {
  const raw = (body: BodyInit, headers: Record<string, string>) =>
    arms.POST(new Request("http://localhost:3000/api/arms", { method: "POST", body, headers: { host: "localhost:3000", cookie: acc.editor, ...headers } }), { params: Promise.resolve({}) });

  it("JSON sent as text/plain, as a form or without a content type is refused with 415 and nothing is stored", async () => {
    const text = JSON.stringify(sampleArm({ name: "Typed wrongly" }));
    for (const type of ["text/plain", "text/plain;charset=UTF-8", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x"]) {
      const res = await raw(text, { "content-type": type });
      expect(res.status, type).toBe(415);
      const body = await res.json();
      expect(body.error.code).toBe("unsupported-media-type");
      expect(body.error.fieldErrors[0].message).toMatch(/send it as application\/json/);
    }
    // A byte body carries no content type of its own.
    const untyped = await raw(new TextEncoder().encode(text), {});
    expect(untyped.status).toBe(415);
    expect((await untyped.json()).error.message).toBe("request body has no content type; send it as application/json");
    const list = await call(arms.GET, "/api/arms", { cookie: acc.editor });
    expect(list.body.arms.map((a: Body) => a.name)).not.toContain("Typed wrongly");
  });

  it("application/json with a charset, and a +json type, are accepted", async () => {
    expect((await raw(JSON.stringify(sampleArm({ name: "Typed with charset" })), { "content-type": "application/json; charset=utf-8" })).status).toBe(201);
    expect((await raw(JSON.stringify(sampleArm({ name: "Typed as +json" })), { "content-type": "application/vnd.armsift+json" })).status).toBe(201);
  });
});

describe("streamed bodies", () => {
  it("a chunked body with no length is read only up to the 1 MiB cap, not to its end", async () => {
    const chunk = new Uint8Array(64 * 1024).fill(0x20);
    let pulled = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        // 64 MiB of spaces in 64 KiB chunks, unless the reader stops early.
        if (pulled >= 64 * 1024 * 1024) return controller.close();
        pulled += chunk.byteLength;
        controller.enqueue(chunk);
      },
    });
    const req = new Request("http://localhost:3000/api/arms", {
      method: "POST", body, duplex: "half",
      headers: { host: "localhost:3000", cookie: acc.editor, "content-type": "application/json" },
    } as RequestInit);
    const res = await arms.POST(req, { params: Promise.resolve({}) });
    expect(res.status).toBe(400);
    expect((await res.json()).error.message).toMatch(/^request body is more than 1,048,576 bytes/);
    // The reader stops at the first chunk past the cap (a stream may have pulled a few ahead).
    expect(pulled).toBeLessThanOrEqual(1024 * 1024 + 4 * chunk.byteLength);
  });

});
