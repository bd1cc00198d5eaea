// The words of Mechweave's e-mails, plain text plus simple HTML.
import type { Message } from "./mailer";

const escape = (text: string) => text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

function compose(to: string, subject: string, paragraphs: string[], link?: { url: string; label: string }): Message {
  const text = [...paragraphs, ...(link ? [`${link.label}: ${link.url}`] : []), "", "— Mechweave"].join("\n\n");
  const html = [
    `<div style="font-family: sans-serif; font-size: 15px; line-height: 1.5; color: #1f2328">`,
    ...paragraphs.map((p) => `<p>${escape(p)}</p>`),
    link ? `<p><a href="${escape(link.url)}" style="color: #0f6c6e; font-weight: 600">${escape(link.label)}</a></p>` : "",
    `<p style="color: #5f6670">— Mechweave</p></div>`,
  ].join("\n");
  return { to, subject, text, html };
}

export function invitationMessage(input: { to: string; inviter: string; title: string; role: string; url: string; expiresAt: Date }): Message {
  return compose(
    input.to,
    `${input.inviter} invited you to “${input.title}” on Mechweave`,
    [
      `${input.inviter} would like you to join the mechanism “${input.title}” as ${input.role === "editor" ? "an editor" : "a viewer"}.`,
      `The link works once and until ${input.expiresAt.toUTCString()}. If you have no account yet, you can create one on the way.`,
    ],
    { url: input.url, label: "Accept the invitation" },
  );
}

export function roleChangedMessage(input: { to: string; actor: string; title: string; role: string | null; url: string }): Message {
  return compose(
    input.to,
    input.role ? `Your role on “${input.title}” is now ${input.role}` : `You were removed from “${input.title}”`,
    [input.role ? `${input.actor} changed your role on “${input.title}” to ${input.role}.` : `${input.actor} removed you from “${input.title}”.`],
    input.role ? { url: input.url, label: "Open the mechanism" } : undefined,
  );
}

export function verificationMessage(input: { to: string; name: string; url: string; expiresAt: Date; waiting: string[] }): Message {
  return compose(
    input.to,
    "Confirm your e-mail address for Mechweave",
    [
      `Hello ${input.name}, please confirm that ${input.to} is your address.`,
      ...(input.waiting.length ? [`Your seat on ${input.waiting.map((t) => `“${t}”`).join(", ")} waits for this confirmation.`] : []),
      `The link works once and until ${input.expiresAt.toUTCString()}. If you did not create a Mechweave account, ignore this message.`,
    ],
    { url: input.url, label: "Confirm my address" },
  );
}

export function passwordResetMessage(input: { to: string; name: string; url: string; expiresAt: Date }): Message {
  return compose(
    input.to,
    "Choose a new Mechweave password",
    [
      `Hello ${input.name}, someone asked to reset the password of the Mechweave account for ${input.to}.`,
      `The link works once and until ${input.expiresAt.toUTCString()}; using it signs out every other session. If you did not ask, ignore this message: your password stays as it is.`,
    ],
    { url: input.url, label: "Choose a new password" },
  );
}
