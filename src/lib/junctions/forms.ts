/** Form schemas (as a browser posts them) for the junction pages. */
import { z } from 'zod';
import { versionSchema } from '$lib/validation';

/** The junctions list's delete button, checked against the version shown. */
export const deleteJunctionFormSchema = z.object({
	junctionId: z.uuid('is not a junction of this dwelling'),
	version: versionSchema
});
