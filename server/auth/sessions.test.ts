import { describe, expect, it } from "vitest";
import { sessionCookie } from "./sessions";

const oldSecret = "old-secret-0123456789";
const newSecret = "new-secret-0123456789";

describe("session cookie secrets", () => {
  it("keeps sessions signed with the old secret while the new one signs", async () => {
    const signedBefore = await sessionCookie([oldSecret], false).serialize("session-1");
    const rotated = sessionCookie([newSecret, oldSecret], false);
    expect(await rotated.parse(signedBefore)).toBe("session-1");
    const signedAfter = await rotated.serialize("session-2");
    expect(await sessionCookie([newSecret], false).parse(signedAfter)).toBe("session-2");
    // Once the old secret is dropped, what it signed is worth nothing.
    expect(await sessionCookie([newSecret], false).parse(signedBefore)).toBeNull();
  });

  it("is Secure only when asked", async () => {
    expect(await sessionCookie([newSecret], true).serialize("s")).toMatch(/; Secure/);
    expect(await sessionCookie([newSecret], false).serialize("s")).not.toMatch(/Secure/);
  });
});
