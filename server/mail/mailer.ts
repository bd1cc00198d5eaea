// Sends Mechweave's e-mail through nodemailer: to SMTP_URL, or to the local mail catcher.
import nodemailer from "nodemailer";

export interface Message {
  to: string;
  subject: string;
  text: string;
  html: string;
}

export interface Mailer {
  send(message: Message): Promise<void>;
}

export function createMailer(smtpUrl: string, from = "Mechweave <no-reply@mechweave.example.test>"): Mailer {
  const transport = nodemailer.createTransport(smtpUrl);
  return {
    async send(message) {
      await transport.sendMail({ from, ...message });
    },
  };
}
