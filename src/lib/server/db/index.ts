import { DATABASE_URL } from 'astro:env/server';
import { createDb } from './client';

/** The app's one pool. Routes reach it through `locals.db`, never by importing this module. */
export const db = createDb(DATABASE_URL);
