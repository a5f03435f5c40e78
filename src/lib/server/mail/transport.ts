import nodemailer, { type Transporter } from 'nodemailer';
import { getEnv } from '../env';

let transporter: Transporter | null = null;

/** SMTP settings: the local fake on loopback by default, a real server when configured. */
export function smtpSettings(): { host: string; port: number; secure: false; ignoreTLS: boolean; auth?: { user: string; pass: string } } {
	const env = getEnv();
	if (env.MAIL_TRANSPORT === 'fake') return { host: '127.0.0.1', port: env.MAIL_FAKE_PORT, secure: false, ignoreTLS: true };
	return {
		host: env.SMTP_HOST,
		port: env.SMTP_PORT,
		secure: false,
		ignoreTLS: false,
		...(env.SMTP_USER ? { auth: { user: env.SMTP_USER, pass: env.SMTP_PASSWORD } } : {})
	};
}

/** True when mail goes to the in-process fake (the mailbox page exists only then). */
export function usesFakeMail(): boolean {
	return getEnv().MAIL_TRANSPORT === 'fake';
}

export type OutgoingMail = { to: string; subject: string; text: string; html: string };

/** Sends one message over SMTP; rejects when the server refuses it. */
export async function sendMail(mail: OutgoingMail): Promise<void> {
	transporter ??= nodemailer.createTransport(smtpSettings());
	await transporter.sendMail({ from: getEnv().MAIL_FROM, ...mail });
}
