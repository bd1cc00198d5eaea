// One connection's rules on the in-memory store: what each role is sent on joining, and when
// the server hangs up (malformed messages, a client too slow to read).
import { afterEach, describe, expect, it, vi } from "vitest";
import { closeCodes } from "./connection";
import { CollabHub } from "./hub";
import { inProcessAnalyzer, MemoryCollabStore } from "./in-memory";
import { join, TestMember } from "./test-member";

let hub: CollabHub | null = null;
afterEach(async () => {
  await hub?.close();
  hub = null;
});

function openHub() {
  const store = new MemoryCollabStore();
  store.addMechanism("m1", "A -> B @ 1\n");
  hub = new CollabHub(store, inProcessAnalyzer, { recomputeMs: 5, snapshotQuietMs: 60_000 });
  return hub;
}

describe("a connection", () => {
  it("asks an editor for what the server lacks, not a viewer; both may sync from the server", async () => {
    const hub = openHub();
    const editor = new TestMember({ userId: "ada", name: "Ada", role: "editor" });
    const viewer = new TestMember({ userId: "vic", name: "Vic", role: "viewer" });
    await join(hub, "m1", editor);
    await join(hub, "m1", viewer);
    // Sync step 1 from the server is [0, 0, …].
    expect(editor.socket.sent.filter((m) => m[0] === 0 && m[1] === 0)).toHaveLength(1);
    expect(viewer.socket.sent.filter((m) => m[0] === 0 && m[1] === 0)).toHaveLength(0);
    viewer.sync();
    expect(viewer.text).toBe("A -> B @ 1\n");
  });

  it("hangs up with 1002 on a malformed message, and hears nothing more once closing", async () => {
    const hub = openHub();
    const member = new TestMember({ userId: "ada", name: "Ada", role: "editor" });
    await join(hub, "m1", member);
    const warn = vi.spyOn(console, "warn").mockImplementation(() => {});
    member.socket.deliver(Uint8Array.of(42));
    expect(member.socket.closedWith?.code).toBe(closeCodes.protocolError);
    expect(warn).toHaveBeenCalledWith(expect.stringContaining("malformed message"));
    warn.mockRestore();

    const sent = member.socket.sent.length;
    member.sync();
    expect(member.socket.sent).toHaveLength(sent);
  });

  it("drops a client that cannot keep up instead of buffering for it", async () => {
    const hub = openHub();
    const slow = new TestMember({ userId: "vic", name: "Vic", role: "viewer" });
    await join(hub, "m1", slow);
    slow.socket.bufferedAmount = 33 * 1024 * 1024;
    const warn = vi.spyOn(console, "warn").mockImplementation(() => {});
    slow.sync();
    expect(slow.socket.closedWith?.code).toBe(closeCodes.tooSlow);
    warn.mockRestore();
  });
});
