// The demo mailbox shows an owner only their own organisation's mail.
import { describe, expect, it } from "vitest";
import { bareAddress, mailOfOrganisation } from "@/app/(app)/mailbox/scope";

describe("demo mailbox scope", () => {
  it("keeps the messages to the organisation's people, and only those recipients", () => {
    const messages = [
      { id: 1, to: ["Grower <Grower@Larkspur.example>"] },
      { id: 2, to: ["owner@elsewhere.example"] },
      { id: 3, to: ["night@larkspur.example", "owner@elsewhere.example"] },
    ];
    const ours = mailOfOrganisation(messages, ["grower@larkspur.example", "night@larkspur.example"]);
    expect(ours).toEqual([
      { id: 1, to: ["Grower <Grower@Larkspur.example>"] },
      { id: 3, to: ["night@larkspur.example"] },
    ]);
    expect(bareAddress(" A <a@b.example> ")).toBe("a@b.example");
  });
});
