/**
 * Text a person types is text: no NUL, no other control characters, and in a one-line name no
 * line break of any kind (a name ends up in headings, CSV cells, mail subjects and SPICE comments,
 * where a line break starts something new). Notes may keep tabs and line breaks. Kept apart from
 * any schema library: the full and the small build of zod both check text by these.
 */
// eslint-disable-next-line no-control-regex -- matching control characters is the point
export const CONTROL_IN_LINE = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/;
// eslint-disable-next-line no-control-regex -- matching control characters is the point
export const CONTROL_IN_NOTES = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/;

export const LINE_MESSAGE = 'Use plain text on one line: no line breaks or control characters';
export const NOTES_MESSAGE = 'Use plain text: no control characters';

export const hasLineControl = (s: string) => CONTROL_IN_LINE.test(s);
export const hasNotesControl = (s: string) => CONTROL_IN_NOTES.test(s);
