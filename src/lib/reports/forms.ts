/** Form schemas of the reports page and the public verification pages (flat, as a browser posts them). */
import { z } from 'zod';

/* ------------------------------------------------------------------ the reports page */
/** The reports page's issue buttons: the dwelling (no element) or one element; "yes" once confirmed. */
export const issueFormSchema = z.object({
	elementId: z.union([z.uuid(), z.literal('')]).default(''),
	/** "yes" once the person has confirmed; without it the action only asks for the confirmation. */
	confirmed: z.enum(['', 'yes']).default('')
});

/** The e-mail form of one issued report, as posted (the address and message are judged by `emailSchema`). */
export const emailFormSchema = z.object({
	reportId: z.uuid({ error: 'Choose a report.' }),
	to: z.string().default(''),
	message: z.string().default('')
});
export type EmailForm = z.infer<typeof emailFormSchema>;

/** The outbox's "try again" button. */
export const retryFormSchema = z.object({ mailId: z.uuid('Choose a message.') });

/* ------------------------------------------------------------------ the code box */

export const verifyCodeFormSchema = z.object({ code: z.string().default('') });

export const VERIFY_CODE_MESSAGE = 'A verification code has ten letters and digits, e.g. K7QM-2XPD-9R.';

/** A verification code once normalised (no dashes or spaces, upper case): ten letters and digits. */
export const isVerificationCode = (normalised: string) => /^[0-9A-Z]{10}$/.test(normalised);

/* ------------------------------------------------------------------ the PDF check */

/** Largest PDF accepted for the comparison. */
export const MAX_PDF_BYTES = 20 * 1024 * 1024;

/**
 * The PDF to compare: the file itself (without JavaScript), or its SHA-256 worked out in the browser so
 * the file never leaves the device (`sha256`, with the file's `name`).
 */
export const pdfCheckFormSchema = z.object({
	pdf: z.instanceof(File).optional(),
	sha256: z.string().default(''),
	name: z.string().default('')
});
export type PdfCheckForm = z.infer<typeof pdfCheckFormSchema>;

/** What the check compares: a hash sent by the browser, or the uploaded file, or why neither will do. */
export function pdfCheckFromForm(
	f: PdfCheckForm
): { hash: string; name: string } | { file: File } | { error: string } {
	const hashed = f.sha256.trim();
	if (hashed) {
		if (!/^[0-9a-f]{64}$/i.test(hashed))
			return { error: 'The file could not be read. Choose the PDF again.' };
		return { hash: hashed.toLowerCase(), name: f.name };
	}
	if (!f.pdf || f.pdf.size === 0) return { error: 'Choose the PDF file you received.' };
	if (f.pdf.size > MAX_PDF_BYTES)
		return { error: 'The file is larger than 20 MB: it is not a report issued here.' };
	return { file: f.pdf };
}
