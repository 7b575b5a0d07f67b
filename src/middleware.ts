import { defineMiddleware, sequence } from 'astro:middleware';
import { db } from '@/lib/server/db/index';

const attachDb = defineMiddleware((context, next) => {
	context.locals.db = db;
	return next();
});

export const onRequest = sequence(attachDb);
