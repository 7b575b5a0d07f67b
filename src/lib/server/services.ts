import { readConfig } from './config';
import { createSmtpMailer } from './mail';

/** Process-wide services built once from the environment. */
export const config = readConfig();
export const mailer = createSmtpMailer(config.smtpUrl, config.mailFrom);
