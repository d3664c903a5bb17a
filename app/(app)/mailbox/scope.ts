// The demo mailbox shows an owner only the mail sent to people of their own organisation: the
// sink holds every organisation's mail.

/** The bare, lower-cased address of a recipient such as `Ana <ana@farm.example>`. */
export function bareAddress(recipient: string): string {
  const m = /<([^>]+)>\s*$/.exec(recipient);
  return (m ? m[1] : recipient).trim().toLowerCase();
}

/** The messages with at least one recipient among `orgEmails`, showing only those recipients. */
export function mailOfOrganisation<M extends { to: string[] }>(messages: M[], orgEmails: Iterable<string>): M[] {
  const ours = new Set([...orgEmails].map((e) => e.toLowerCase()));
  return messages.flatMap((m) => {
    const to = m.to.filter((r) => ours.has(bareAddress(r)));
    return to.length ? [{ ...m, to }] : [];
  });
}
