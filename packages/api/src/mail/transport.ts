/** The SMTP transport (nodemailer) to the relay of LW_SMTP_HOST/LW_SMTP_PORT; a local fake in dev and tests. */
import nodemailer, { type Transporter } from 'nodemailer';
import type { HandoffConfig } from './config.ts';

export function createMailTransport(smtp: HandoffConfig['smtp']): Transporter {
  return nodemailer.createTransport({
    host: smtp.host,
    port: smtp.port,
    secure: smtp.port === 465,
    ignoreTLS: smtp.ignoreTls,
    connectionTimeout: smtp.timeoutMs,
    greetingTimeout: smtp.timeoutMs,
    socketTimeout: smtp.timeoutMs,
  });
}
