import nodemailer from 'nodemailer';
import { config } from '../config';

/** The SMTP transport: the local catcher by default, a real relay by setting SMTP_URL. */
export const mailTransport = nodemailer.createTransport(config.SMTP_URL);
