import { readConfig } from './config';
import { createSmtpMailer } from './mail';
import { createS3Storage } from './storage';

/** Process-wide services built once from the environment. */
export const config = readConfig();
export const mailer = createSmtpMailer(config.smtpUrl, config.mailFrom);
export const storage = createS3Storage(config.s3);
