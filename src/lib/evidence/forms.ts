/**
 * Form schemas of the evidence forms (flat, as a browser posts them). The request's note and due date are
 * checked by the evidence service with the schema the JSON API uses; its issues name the same fields.
 */
import { z } from 'zod';

/** A supervisor's request for evidence on an audit item: what is needed, and by when. */
export const evidenceRequestFormSchema = z.object({
	itemId: z.uuid({ error: 'No such audit item.' }),
	note: z.string().default(''),
	dueDate: z.string().default('')
});
export type EvidenceRequestForm = z.infer<typeof evidenceRequestFormSchema>;

/** The request form's id: it is posted from the audit item's page, beside that page's own form. */
export const EVIDENCE_REQUEST_FORM_ID = 'evidence-request';

/** The request form as the service's input (the API's `{ note, dueDate }`), the item apart. */
export function evidenceRequestFromForm(f: EvidenceRequestForm): { note: string; dueDate: string } {
	return { note: f.note, dueDate: f.dueDate.trim() };
}

/** A request marked answered without a new upload ("already provided", "no longer needed"). */
export const evidenceAnswerFormSchema = z.object({
	itemId: z.uuid({ error: 'is not an audit item' }),
	requestId: z.uuid({ error: 'is not an evidence request' })
});

/** Deleting one file of evidence. */
export const evidenceDeleteFormSchema = z.object({
	evidenceId: z.uuid({ error: 'is not a file of evidence' })
});
