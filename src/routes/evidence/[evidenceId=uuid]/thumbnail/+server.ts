import { evidenceFile } from '../../_file';

/** The JPEG thumbnail of a photo of evidence (its members only); 404 for a PDF. */
export const GET = (event) => evidenceFile(event, 'thumbnail');
